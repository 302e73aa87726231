"""Case-file validation: unknown keys named with the nearest valid one, ranges stated."""

import pytest

from moc.errors import CaseFileError
from moc.io import case


def test_defaults_and_required():
    c = case.validate({"nozzle": {"exit_mach": 2.5}})
    assert c["nozzle"]["geometry"] == "axisymmetric"
    assert c["gas"]["gamma"] == 1.4
    with pytest.raises(CaseFileError, match="exit_mach is required"):
        case.validate({"nozzle": {}})


@pytest.mark.parametrize("raw,pattern", [
    ({"nozzle": {"exit_mach": 3, "exitmach": 2}}, r"unknown key 'exitmach' in \[nozzle\]; the nearest valid key is 'exit_mach'"),
    ({"nozle": {"exit_mach": 3}}, r"unknown section \[nozle\]; the nearest valid section is 'nozzle'"),
    ({"exit_mach": 3}, r"belongs in section \[nozzle\]"),
    ({"nozzle": {"exit_mach": 0.9}}, r"exit_mach must be above 1"),
    ({"nozzle": {"exit_mach": 2, "characteristics": 2}}, r"characteristics must be at least 3"),
    ({"nozzle": {"exit_mach": 2, "throat_size": -1}}, r"throat_size must be above 0"),
    ({"nozzle": {"exit_mach": 2, "throat_unit": "furlong"}}, r"throat_unit must be one of"),
    ({"nozzle": {"exit_mach": 2, "geometry": "axisymetric"}}, r"did you mean 'axisymmetric'"),
    ({"nozzle": {"exit_mach": 2}, "gas": {"gamma": 1.0}}, r"gamma must be above 1"),
    ({"nozzle": {"exit_mach": 2}, "truncate": {"length_fraction": 0.8, "area_ratio": 2}}, r"takes one of"),
])
def test_bad_cases_name_the_fault(raw, pattern):
    with pytest.raises(CaseFileError, match=pattern):
        case.validate(raw)


def test_bundled_cases_validate():
    from pathlib import Path

    for p in sorted(Path(__file__).parents[1].joinpath("cases").glob("*.toml")):
        case.load(p)


def test_reference_doc_is_current():
    from pathlib import Path

    doc = Path(__file__).parents[1].joinpath("docs", "case-file.md").read_text()
    assert case.reference_markdown().strip() in doc


def test_atomic_write_keeps_usual_mode_and_refuses_overwrite(tmp_path):
    # common practice: files get the mode the umask gives (not owner-only), and an
    # existing file is kept unless forced.
    import os

    from moc.errors import FileExistsRefusal
    from moc.io.atomic import atomic_write

    p = tmp_path / "a.txt"
    atomic_write(p, "one")
    umask = os.umask(0)
    os.umask(umask)
    assert p.stat().st_mode & 0o777 == 0o666 & ~umask
    with pytest.raises(FileExistsRefusal, match="--force"):
        atomic_write(p, "two", force=False)
    assert p.read_text() == "one"
    assert [q.name for q in tmp_path.iterdir()] == ["a.txt"]
