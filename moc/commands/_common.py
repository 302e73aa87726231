"""Small helpers shared by command modules."""

import json
import sys


def print_json(obj):
    print(json.dumps(obj, indent=2, sort_keys=True))


def progress_enabled(args):
    """Progress goes to stderr only for an interactive terminal, and never with --quiet or --json."""
    return sys.stderr.isatty() and not getattr(args, "quiet", False) and not getattr(args, "json", False)


def print_table(rows, title=None):
    """Print (label, value, unit) rows aligned."""
    if title:
        print(title)
    w = max(len(r[0]) for r in rows)
    for label, value, unit in rows:
        v = f"{value:.6g}" if isinstance(value, float) else str(value)
        print(f"  {label:<{w}}  {v:>12} {unit}".rstrip())
