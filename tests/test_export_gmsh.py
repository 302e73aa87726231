"""Both Gmsh files read by Gmsh itself (optional: runs where the gmsh package is installed, `pip install gmsh`)."""

import numpy as np
import pytest

from moc.io.export import export
from test_export_common import THROAT_MM, source_flow_result

gmsh = pytest.importorskip("gmsh")


@pytest.fixture()
def session():
    gmsh.initialize()
    gmsh.option.setNumber("General.Terminal", 0)
    yield gmsh
    gmsh.finalize()


def test_gmsh_reads_domain_groups_and_flowfield_views(tmp_path, session):
    res = source_flow_result()
    export(res, ["msh", "mesh-msh"], tmp_path, units="mm", options={"axial_cells": 30, "radial_cells": 12})
    session.open(str(tmp_path / "domain.msh"))
    names = {session.model.getPhysicalName(d, t): d for d, t in session.model.getPhysicalGroups()}
    assert names == {"fluid": 2, "inlet": 1, "outlet": 1, "wall": 1, "axis": 1}
    tags, _, _ = session.model.mesh.getNodes()
    assert len(tags) == 31 * 13
    session.clear()
    for v in session.view.getTags():
        session.view.remove(v)
    session.open(str(tmp_path / "flowfield.msh"))
    tags, coord, _ = session.model.mesh.getNodes()
    xyz = coord.reshape(-1, 3)[np.argsort(tags)]
    assert np.allclose(xyz[:, 0], res.net.x * THROAT_MM, rtol=1e-12, atol=1e-12)
    views = session.view.getTags()
    names = [session.option.getString(f"View[{session.view.getIndex(v)}].Name") for v in views]
    assert "mach" in names and "velocity_a0" in names
    v = views[names.index("mach")]
    _, ntags, data, _, ncomp = session.view.getModelData(v, 0)
    mach = np.array(data).ravel()[np.argsort(ntags)]
    assert ncomp == 1 and np.allclose(mach, res.net.mach, rtol=1e-12)
