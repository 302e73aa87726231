"""`moc export` end to end: acceptance formats, refusal without --force, all-or-nothing writes, bad input."""

import json

import numpy as np
import pytest

from moc.cli import main
from test_export_common import source_flow_result

ACCEPT = ["wall_points.csv", "wall.dxf", "wall.stl", "flowfield.vtu", "domain.su2"]


@pytest.fixture()
def saved(tmp_path):
    d = tmp_path / "res"
    d.mkdir()
    source_flow_result().save(d)
    return d


def snapshot(folder):
    return {p.name: (p.read_bytes(), p.stat().st_mtime_ns) for p in sorted(folder.iterdir())}


def test_acceptance_formats_then_refusal_without_force(saved, tmp_path, capsys):
    import ezdxf
    import meshio

    out = tmp_path / "out"
    args = ["export", str(saved), "--format", "csv,dxf,stl,vtu,su2", "--units", "mm", "-o", str(out)]
    assert main(args) == 0
    printed = capsys.readouterr().out
    assert "largest skew" in printed and "largest chord error" in printed
    assert sorted(p.name for p in out.iterdir()) == sorted(ACCEPT)
    assert ezdxf.readfile(out / "wall.dxf").dxfversion == "AC1015"
    assert len(meshio.read(out / "wall.stl").cells_dict["triangle"]) > 0
    assert "mach" in meshio.read(out / "flowfield.vtu").point_data
    su2 = open(out / "domain.su2", encoding="utf-8").read()
    for marker in ("inlet", "outlet", "wall", "axis"):
        assert f"MARKER_TAG= {marker}\n" in su2
    before = snapshot(out)
    assert main(args) == 2
    err = capsys.readouterr().err
    assert "already exists" in err and "--force" in err and "Traceback" not in err
    assert snapshot(out) == before
    assert main(args + ["--force"]) == 0


def test_a_failing_format_leaves_nothing_behind(saved, tmp_path, monkeypatch, capsys):
    import moc.io.export.vtu as vtu

    out = tmp_path / "out"
    out.mkdir()
    (out / "wall_points.csv").write_text("the user's own file\n")

    def broken(path, ctx):
        open(path, "w").write("half a file")
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(vtu, "write", broken)
    assert main(["export", str(saved), "--format", "csv,stl,vtu", "-o", str(out), "--force"]) == 2
    err = capsys.readouterr().err
    assert "disk full" in err and "Traceback" not in err
    assert [p.name for p in out.iterdir()] == ["wall_points.csv"]
    assert (out / "wall_points.csv").read_text() == "the user's own file\n"


def test_json_output_and_default_directory(saved, capsys):
    assert main(["export", str(saved), "--format", "csv", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["unit"] == "mm" and doc["files"]["csv"].endswith("export/wall_points.csv")
    assert (saved / "export" / "wall_points.csv").exists()
    # the result file itself may be given: files go beside it, into export/
    assert main(["export", str(saved / "result.npz"), "--format", "stl", "-q"]) == 0
    assert (saved / "export" / "wall.stl").exists()


@pytest.mark.parametrize("extra,needle", [
    (["--format", "csv,step"], "known formats: csv, dxf, stl"),
    (["--format", "csv", "--units", "psi"], "not a length unit"),
    (["--format", "csv", "--chord-tolerance", "0"], "chord-tolerance"),
    (["--format", "csv", "--chord-tolerance", "-0.1"], "chord-tolerance"),
    (["--format", "stl", "--segments", "2"], "segments"),
])
def test_bad_input_exits_2_with_one_sentence(saved, tmp_path, capsys, extra, needle):
    assert main(["export", str(saved), "-o", str(tmp_path / "o")] + extra) == 2
    err = capsys.readouterr().err
    assert needle in err and "Traceback" not in err
    assert not (tmp_path / "o").exists() or not any((tmp_path / "o").iterdir())


def test_missing_or_incompatible_result_exits_2(saved, tmp_path, capsys):
    assert main(["export", str(tmp_path / "nowhere"), "--format", "csv"]) == 2
    assert "no saved result" in capsys.readouterr().err
    with np.load(saved / "result.npz") as z:
        d = {k: z[k] for k in z.files}
    d["format_version"] = np.array(999)
    np.savez(saved / "result.npz", **d)
    assert main(["export", str(saved), "--format", "csv"]) == 2
    assert "version" in capsys.readouterr().err


def test_help_lists_every_format(capsys):
    from moc.io.export import FORMATS
    with pytest.raises(SystemExit):
        main(["export", "--help"])
    text = capsys.readouterr().out
    for f in FORMATS:
        assert f in text


def test_all_formats_on_planar_result_skip_the_sector(tmp_path):
    d = tmp_path / "p"
    d.mkdir()
    source_flow_result("planar").save(d)
    assert main(["export", str(d), "--format", "all", "-o", str(tmp_path / "o"), "-q"]) == 0
    names = {p.name for p in (tmp_path / "o").iterdir()}
    assert "flowfield_sector.vtu" not in names and {"domain.su2", "domain.msh", "flowfield.xdmf"} <= names
