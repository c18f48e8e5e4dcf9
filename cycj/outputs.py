"""Writing outputs so that nothing is lost: a temporary folder renamed into place at the end.

An existing, non-empty output folder is refused unless ``force`` is given; a run stopped by an
error or Ctrl-C leaves no partial folder behind.  Inputs are never written.
"""

from __future__ import annotations

import json
import math
import os
import platform
import shutil
import sys
import tempfile
from datetime import UTC, datetime
from pathlib import Path

from cycj.errors import CycjInputError


def _jsonable(obj):
    import numpy as np

    if isinstance(obj, dict):
        return {str(k): _jsonable(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_jsonable(v) for v in obj]
    if isinstance(obj, Path):
        return str(obj)
    if isinstance(obj, np.ndarray):
        return _jsonable(obj.tolist())
    if isinstance(obj, np.generic):
        return _jsonable(obj.item())
    if isinstance(obj, float) and not math.isfinite(obj):
        return None if math.isnan(obj) else ("inf" if obj > 0 else "-inf")
    return obj


def dumps(obj) -> str:
    """JSON text with numpy values made plain and non-finite floats made explicit."""
    return json.dumps(_jsonable(obj), indent=2, ensure_ascii=False)


class OutputDir:
    """Context manager: files go into a temporary sibling folder, renamed to ``target`` on
    success and removed on any error.

    Parameters
    ----------
    target : path of the output folder
    force : replace an existing non-empty folder (its old content is removed only after the
        new outputs are complete)
    inputs : paths that must never be written (an output folder containing one is refused)
    """

    def __init__(self, target, force: bool = False, inputs=()):
        self.target = Path(target)
        self.force = force
        if self.target.exists() and not self.target.is_dir():
            raise CycjInputError("output path exists and is not a folder", source=str(target))
        if self.target.is_dir() and any(self.target.iterdir()) and not force:
            raise CycjInputError(
                "output folder is not empty (use --force to replace it)", source=str(target)
            )
        tgt = self.target.resolve()
        for p in inputs:
            if p is not None and tgt in Path(p).resolve().parents:
                raise CycjInputError(
                    "output folder contains an input file; choose another",
                    source=str(target),
                    found=str(p),
                )
        self.tmp: Path | None = None

    def __enter__(self):
        parent = self.target.resolve().parent
        parent.mkdir(parents=True, exist_ok=True)
        self.tmp = Path(tempfile.mkdtemp(prefix=f".{self.target.name}.tmp-", dir=parent))
        return self

    def __exit__(self, exc_type, exc, tb):
        if exc_type is not None:
            shutil.rmtree(self.tmp, ignore_errors=True)
            return False
        if self.target.exists():
            old = self.target.with_name(f".{self.target.name}.old-{os.getpid()}")
            os.replace(self.target, old)
            os.replace(self.tmp, self.target)
            shutil.rmtree(old, ignore_errors=True)
        else:
            os.replace(self.tmp, self.target)
        return False

    def path(self, name: str) -> Path:
        """Path of an output file inside the (temporary) folder."""
        return self.tmp / name

    def final_path(self, name: str) -> Path:
        """Where the file will be once the outputs are complete."""
        return self.target / name

    def write_text(self, name: str, text: str) -> Path:
        p = self.path(name)
        p.write_text(text, encoding="utf-8")
        return p

    def write_json(self, name: str, data) -> Path:
        return self.write_text(name, dumps(data) + "\n")

    def write_csv(self, name: str, frame, **kw) -> Path:
        p = self.path(name)
        frame.to_csv(p, index=False, **kw)
        return p

    def savefig(self, name: str, fig, dpi: int = 110) -> Path:
        import matplotlib.pyplot as plt

        p = self.path(name)
        fig.savefig(p, dpi=dpi, bbox_inches="tight")
        plt.close(fig)
        return p


def sha256_of(path) -> str:
    import hashlib

    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def provenance(inputs: dict | None = None, **extra) -> dict:
    """Version, platform, time and SHA-256 of each input file (``{name}_sha256``)."""
    import numpy as np

    from cycj._version import __version__

    out = {
        "cycj_version": __version__,
        "python": sys.version.split()[0],
        "numpy": np.__version__,
        "platform": platform.platform(),
        "created_utc": datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ"),
    }
    for name, p in (inputs or {}).items():
        if p is not None and Path(p).is_file():
            out[f"{name}_sha256"] = sha256_of(p)
            out[f"{name}_path"] = str(p)
    out.update(extra)
    return out


def record_provenance(summary: dict, inputs: dict | None = None, **extra) -> dict:
    """Put :func:`provenance` into ``summary["provenance"]`` and copy each input's SHA-256 to
    the top level (``case_sha256``, ``history_sha256`` …); returns ``summary``."""
    prov = provenance(inputs, **extra)
    summary["provenance"] = prov
    for k, v in prov.items():
        if k.endswith("_sha256"):
            summary[k] = v
    return summary
