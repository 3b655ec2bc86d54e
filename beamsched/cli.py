"""Command line: ``beamsched check``, ``beamsched demo``, ``beamsched template``."""

from __future__ import annotations

import argparse
import sys

from . import CAUTION, __version__


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="beamsched", description="Check a concrete beam schedule.",
                                     epilog=CAUTION)
    parser.add_argument("--version", action="version", version=f"beamsched {__version__}")
    parser.parse_args(argv)
    print(CAUTION, file=sys.stderr)
    return 0


if __name__ == "__main__":
    sys.exit(main())
