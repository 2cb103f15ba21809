"""The speed comparison script (bench/compare.py) runs end to end on a small
batch and finds flatray, the NumPy baseline and the C loop in agreement (its
timings are printed, never asserted)."""

from __future__ import annotations

import shutil
import sys

import pytest

from conftest import PACKAGE_ROOT

sys.path.insert(0, str(PACKAGE_ROOT / "bench"))


@pytest.mark.skipif(shutil.which("gcc") is None, reason="the C loop needs gcc")
def test_compare_runs_and_the_three_agree(capsys):
    import compare

    status = compare.main(["--points", "3000", "--repeats", "1", "--no-one-thread"])
    out = capsys.readouterr().out
    assert status == 0, out
    assert "all three agree" in out
    assert out.count("bit for bit: yes") == 5
    assert "| lines of sight, 3 layers |" in out


def test_numpy_baseline_reports_failures_as_nan():
    import numpy as np

    import flatray
    import numpy_baseline as base

    lake = flatray.Stack.single_interface((0, 0, 0), (0, 0, -1), 1.0, 1.333)
    objects = np.array([[1.0, 0.0, -1.0], [1.0, 0.0, 1.0]])  # the second is above water
    eye = np.array([[0.0, 0.0, 2.0]])
    for image in ("sagittal", "tangential"):
        ours, status = flatray.apparent_positions(lake, eye, objects, image)
        theirs = base.apparent_positions(lake, eye, objects, image)
        assert status.tolist() == [0, 5]
        assert np.isnan(theirs[1]).all()
        assert np.allclose(theirs[0], ours[0], rtol=0, atol=1e-12)
    seen, _ = flatray.apparent_positions(lake, eye, objects, "sagittal")
    truth = base.true_positions_sagittal(lake, np.tile(eye, (2, 1)), seen)
    assert np.isnan(truth[1]).all() and np.allclose(truth[0], objects[0], rtol=0, atol=1e-12)
