"""Every reference table carries provenance, and an accidental edit fails CI (sha256)."""

import glob
import os

import pytest

from uvcheck.data_files import data_root, read_table, read_toml, sha256_of


def _registries():
    root = data_root()
    return sorted(os.path.relpath(p, root) for p in glob.glob(str(root / "**" / "*.toml"), recursive=True))


@pytest.mark.parametrize("reg", _registries())
def test_checksums(reg):
    folder = os.path.dirname(reg)
    for key, entry in read_toml(reg).items():
        if isinstance(entry, dict) and "file" in entry and "sha256" in entry:
            rel = f"{folder}/{entry['file']}" if folder else entry["file"]
            assert sha256_of(rel) == entry["sha256"], f"{rel} changed: update its registry entry"


def test_every_csv_has_a_provenance_header():
    root = data_root()
    for p in glob.glob(str(root / "**" / "*.csv"), recursive=True):
        rel = os.path.relpath(p, root)
        t = read_table(rel)
        assert t.header, f"{rel} has no '#' provenance header"
