"""tools/compare_runs.py, the before/after comparison DEVELOPERS.md asks for when a change must
leave every result as it was: the same run compares equal, and a changed number is caught."""

from __future__ import annotations

import importlib.util
import pickle
from pathlib import Path

TOOL = Path(__file__).resolve().parents[1] / "tools" / "compare_runs.py"


def load():
    spec = importlib.util.spec_from_file_location("compare_runs", TOOL)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)  # type: ignore[union-attr]
    return module


def test_a_run_equals_itself_and_a_changed_number_is_reported(tmp_path, capsys):
    tool = load()
    a, b = tmp_path / "a.pkl", tmp_path / "b.pkl"
    assert tool.main(["dump", str(a), "--spans", "12", "--seed", "3"]) == 0
    assert tool.main(["dump", str(b), "--spans", "12", "--seed", "3"]) == 0
    assert tool.main(["diff", str(a), str(b)]) == 0  # the checks are pure functions of the input
    rows = pickle.loads(b.read_bytes())
    checks = next(r[2] for r in rows if any(isinstance(c[4], float) for c in r[2]))
    i = next(j for j, c in enumerate(checks) if isinstance(c[4], float))
    cid, loc, st, demand, capacity, util, note = checks[i]
    checks[i] = (cid, loc, st, demand, capacity * (1 + 1e-9) + 1e-9, util, note)
    b.write_bytes(pickle.dumps(rows))
    capsys.readouterr()
    assert tool.main(["diff", str(a), str(b)]) == 1
    assert "capacity" in capsys.readouterr().out
    assert tool.main(["diff", str(a), str(b), "--rel", "1e-6"]) == 0  # within the tolerance asked for
