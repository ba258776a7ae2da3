"""Shared by the reference-table generators: write a CSV table under tests/reference, or with
--check compare the committed one (its two comment lines excepted) and exit 1 if it differs."""
import sys


def write_or_check(path, header, rows):
    text = "\n".join(header + list(rows)) + "\n"
    if "--check" in sys.argv:
        same = open(path).read().splitlines()[2:] == text.splitlines()[2:]
        print("table matches" if same else "table differs")
        return 0 if same else 1
    open(path, "w").write(text)
    return 0
