"""Outputs are never lost: temp folder renamed into place, non-empty folders refused."""

import pytest

from cycj.errors import CycjInputError
from cycj.outputs import OutputDir, provenance
from cycj.report import CAUTION, render_report


def test_output_dir_renamed_on_success(tmp_path):
    out = tmp_path / "out"
    with OutputDir(out) as od:
        od.write_json("a.json", {"x": float("inf")})
        assert not out.exists()
    assert (out / "a.json").read_text().strip().endswith("}")
    assert '"inf"' in (out / "a.json").read_text()


def test_output_dir_removed_on_error(tmp_path):
    out = tmp_path / "out"
    with pytest.raises(RuntimeError), OutputDir(out) as od:
        od.write_text("half.txt", "partial")
        raise RuntimeError("stop")
    assert not out.exists()
    assert not [p for p in tmp_path.iterdir()]  # no work folder, no lock left


def test_non_empty_refused_unless_force(tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    (out / "old.txt").write_text("keep me")
    with pytest.raises(CycjInputError, match="not empty"):
        OutputDir(out)
    # --force replaces only a folder cycj wrote: this one has no manifest
    with pytest.raises(CycjInputError, match="only a folder cycj wrote"):
        OutputDir(out, force=True)
    assert (out / "old.txt").read_text() == "keep me"
    (out / "old.txt").unlink()
    with OutputDir(out) as od:
        od.write_text("first.txt", "first")
    with OutputDir(out, force=True) as od:
        od.write_text("new.txt", "new")
    assert sorted(p.name for p in out.iterdir()) == [".cycj-output.json", "new.txt"]


def test_report_has_caution_and_only_embedded_images(tmp_path):
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    fig, ax = plt.subplots()
    ax.plot([0, 1], [0, 1])
    png = tmp_path / "p.png"
    fig.savefig(png)
    plt.close(fig)
    text = render_report(
        title="t", question="q", answer="a", figures=[("c", png)], references=["Ainsworth (1984)"]
    )
    assert CAUTION in text and "Ainsworth (1984)" in text
    assert "data:image/png;base64," in text
    assert "http://" not in text and "https://" not in text


def test_provenance_hashes_inputs(tmp_path):
    f = tmp_path / "case.toml"
    f.write_text("x = 1\n")
    p = provenance({"case": f})
    assert len(p["case_sha256"]) == 64 and p["cycj_version"]
