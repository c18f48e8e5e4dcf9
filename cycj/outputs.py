"""Writing outputs so that nothing is lost: a temporary folder renamed into place at the end.

An existing, non-empty output folder is refused unless ``force`` is given, and ``force`` replaces
only a folder cycj wrote (it holds the manifest ``.cycj-output.json``); a folder holding an
input or the current folder is always refused.  A run stopped by an error or Ctrl-C leaves no
partial folder behind.  Inputs are never written.
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
from cycj.inputs_read import inputs_read

#: the folder every command's outputs go to by default, under the current folder
DEFAULT_ROOT = "out"


def default_out(command: str, first_input, out_dir=None) -> Path:
    """The output folder of ``command``: ``out_dir`` when given, else the one rule of every
    command, ``out/<command>-<stem of its first input>`` under the current folder (``run`` of
    several cases: ``out/run-fleet``)."""
    if out_dir:
        return Path(out_dir)
    stem = "fleet" if first_input is None else Path(first_input).stem
    return Path(DEFAULT_ROOT) / f"{command}-{stem}"


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


def _short(value, n: int = 80) -> str:
    s = str(value)
    return s if len(s) <= n else s[: n - 1] + "…"


def dumps(obj) -> str:
    """JSON text with numpy values made plain and non-finite floats made explicit."""
    return json.dumps(_jsonable(obj), indent=2, ensure_ascii=False)


#: name of the manifest written inside every output folder (cycj replaces only such folders)
MANIFEST = ".cycj-output.json"
#: name parts of cycj's own work folders beside an output folder: ``.NAME.cycj-tmp-PID-XXXX``
#: (outputs being written) and ``.NAME.cycj-old-PID-XXXX`` (the replaced folder, being removed)
TMP_TAG = ".cycj-tmp-"
OLD_TAG = ".cycj-old-"
#: lock file beside the output folder while a run writes it: ``.NAME.cycj-lock``
LOCK_TAG = ".cycj-lock"


def _pid_alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:  # pragma: no cover - someone else's live process
        return True
    return True


def _is_within(path: Path, folder: Path) -> bool:
    return path == folder or folder in path.parents


def _files_under(folder: Path) -> list[str]:
    return sorted(
        p.relative_to(folder).as_posix()
        for p in folder.rglob("*")
        if (p.is_file() or p.is_symlink()) and p.relative_to(folder).as_posix() != MANIFEST
    )


def _foreign_files(folder: Path) -> list[str]:
    """Files under ``folder`` that no manifest lists (the folder's own, or that of a
    sub-folder cycj wrote inside it, e.g. the stages of ``cycj demo``)."""
    listed: dict[Path, set] = {}

    def owned(f: Path) -> bool:
        d = f.parent
        while True:
            if d not in listed:
                man = _read_manifest(d)
                listed[d] = set(man.get("files") or []) if man else set()
            if f.relative_to(d).as_posix() in listed[d]:
                return True
            if d == folder:
                return False
            d = d.parent

    out = []
    for f in sorted(folder.rglob("*")):
        if f.is_dir() and not f.is_symlink():
            continue
        if f.name == MANIFEST and _read_manifest(f.parent) is not None:
            continue
        if not owned(f):
            out.append(f.relative_to(folder).as_posix())
    return out


def adopt_file(folder, name: str) -> None:
    """List file ``name`` (relative to ``folder``, written there by cycj after the folder was
    completed) in the folder's manifest, so that ``--force`` may replace it later."""
    folder = Path(folder)
    man = _read_manifest(folder)
    if man is None:
        return
    files = set(man.get("files") or [])
    files.add(Path(name).as_posix())
    man["files"] = sorted(files)
    (folder / MANIFEST).write_text(json.dumps(man, indent=1) + "\n", encoding="utf-8")


def _read_manifest(folder: Path) -> dict | None:
    try:
        data = json.loads((folder / MANIFEST).read_text(encoding="utf-8"))
    except (OSError, ValueError, UnicodeDecodeError):
        return None
    return data if isinstance(data, dict) and data.get("cycj_output") is True else None


class OutputDir:
    """Context manager: files go into a temporary sibling folder, renamed to ``target`` on
    success and removed on any error.

    Nothing the user owns is replaced: ``force`` replaces only a folder cycj wrote (its
    manifest :data:`MANIFEST` lists every file in it); a folder holding an input file, the
    current folder (or one holding it) and a foreign non-empty folder are refused with one
    line.  A lock file beside the target (created exclusively) makes a second writer fail;
    work folders left by a killed run (:data:`TMP_TAG`, :data:`OLD_TAG`, with a manifest) are
    removed by the next run to the same target.

    Parameters
    ----------
    target : path of the output folder
    force : replace an existing non-empty folder written by cycj (its old content is removed
        only after the new outputs are complete)
    inputs : paths that must never be written (an output folder containing one is refused);
        every file noted with :func:`note_input` is added
    """

    def __init__(self, target, force: bool = False, inputs=()):
        self.target = Path(target)
        self.force = force
        self.inputs = [Path(p) for p in inputs if p is not None]
        self.tmp: Path | None = None
        self._lock: Path | None = None
        self._check()

    # ----------------------------------------------------------------------------- checks
    def _check(self) -> None:
        src = str(self.target)
        tgt = self.target.resolve()
        if tgt.exists() and not tgt.is_dir():
            raise CycjInputError("output path exists and is not a folder", source=src)
        if tgt.parent == tgt:
            raise CycjInputError("the output folder cannot be the file system root", source=src)
        try:
            cwd = Path.cwd().resolve()
        except OSError:  # pragma: no cover - the current folder was removed
            cwd = None
        if cwd is not None and _is_within(cwd, tgt):
            raise CycjInputError(
                "output folder is the current folder or holds it; choose a new folder",
                source=src,
                expected="e.g. --out results",
            )
        for p in [*self.inputs, *inputs_read()]:
            if _is_within(p.resolve(), tgt):
                raise CycjInputError(
                    "output folder contains an input file; choose another",
                    source=src,
                    found=p.resolve().relative_to(tgt).as_posix(),
                )
        if not tgt.is_dir() or not any(tgt.iterdir()):
            return
        if not self.force:
            raise CycjInputError(
                "output folder is not empty (use --force to replace it)", source=src
            )
        manifest = _read_manifest(tgt)
        if manifest is None:
            raise CycjInputError(
                f"--force replaces only a folder cycj wrote (with {MANIFEST}); this one has none",
                source=src,
                expected="an output folder of cycj, or a new folder",
            )
        extra = _foreign_files(tgt)
        if extra:
            raise CycjInputError(
                "--force refused: the output folder holds files cycj did not write",
                source=src,
                found=_short(extra[0]),
            )

    # --------------------------------------------------------------------- lock and stale
    def _acquire_lock(self, parent: Path) -> None:
        lock = parent / f".{self.target.resolve().name}{LOCK_TAG}"
        info = json.dumps({"pid": os.getpid(), "host": platform.node()})
        for attempt in range(2):
            try:
                fd = os.open(lock, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o644)
            except FileExistsError:
                if attempt == 0 and self._stale_lock(lock):
                    lock.unlink(missing_ok=True)
                    continue
                raise CycjInputError(
                    "another cycj run is writing this output folder (remove the lock file "
                    "only if no run is active)",
                    source=str(self.target),
                    found=str(lock),
                ) from None
            with os.fdopen(fd, "w") as fh:
                fh.write(info)
            self._lock = lock
            return

    @staticmethod
    def _stale_lock(lock: Path) -> bool:
        try:
            data = json.loads(lock.read_text(encoding="utf-8"))
            pid, host = int(data["pid"]), data["host"]
        except (OSError, ValueError, KeyError, TypeError):
            return False
        return host == platform.node() and pid != os.getpid() and not _pid_alive(pid)

    def _remove_stale(self, parent: Path) -> None:
        """Remove work folders of earlier runs to this target (the lock is held, so none is
        live): only names of cycj's pattern that hold cycj's manifest."""
        name = self.target.resolve().name
        prefixes = tuple(f".{name}{tag}" for tag in (TMP_TAG, OLD_TAG))
        for p in parent.iterdir():
            if not p.name.startswith(prefixes) or p.is_symlink() or not p.is_dir():
                continue
            if _read_manifest(p) is not None:
                shutil.rmtree(p, ignore_errors=True)

    def _release_lock(self) -> None:
        if self._lock is not None:
            self._lock.unlink(missing_ok=True)
            self._lock = None

    # -------------------------------------------------------------------------- context
    def __enter__(self):
        parent = self.target.resolve().parent
        parent.mkdir(parents=True, exist_ok=True)
        self._acquire_lock(parent)
        try:
            self._check()
            self._remove_stale(parent)
            name = self.target.resolve().name
            self.tmp = Path(tempfile.mkdtemp(prefix=f".{name}{TMP_TAG}{os.getpid()}-", dir=parent))
            self._write_manifest(self.tmp, complete=False)
        except BaseException:
            self._release_lock()
            raise
        return self

    def _write_manifest(self, folder: Path, complete: bool) -> None:
        from cycj._version import __version__

        data = {
            "cycj_output": True,
            "complete": complete,
            "cycj_version": __version__,
            "created_utc": datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ"),
            "files": _files_under(folder) if complete else [],
        }
        (folder / MANIFEST).write_text(json.dumps(data, indent=1) + "\n", encoding="utf-8")

    def __exit__(self, exc_type, exc, tb):
        try:
            if exc_type is not None:
                shutil.rmtree(self.tmp, ignore_errors=True)
                return False
            self._write_manifest(self.tmp, complete=True)
            target = self.target.resolve()
            if target.exists():
                old = self.tmp.with_name(self.tmp.name.replace(TMP_TAG, OLD_TAG, 1))
                os.replace(target, old)
                os.replace(self.tmp, target)
                if _read_manifest(old) is not None:
                    shutil.rmtree(old, ignore_errors=True)
                else:  # an empty folder of the user's: nothing to remove but itself
                    try:
                        old.rmdir()
                    except OSError:  # pragma: no cover - someone wrote into it meanwhile
                        pass
            else:
                os.replace(self.tmp, target)
        finally:
            self._release_lock()
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
        """Write a DataFrame (``to_csv(index=False, **kw)``) or float columns
        ``{name: array}`` (:func:`columns_csv`: the same bytes, without pandas) as CSV."""
        if isinstance(frame, dict) and not kw:
            return self.write_text(name, columns_csv(frame))
        p = self.path(name)
        frame.to_csv(p, index=False, **kw)
        return p

    def savefig(self, name: str, fig, dpi: int = 110, tight: bool = True) -> Path:
        """Write ``fig`` as PNG with tidy axes (:func:`cycj.display.tidy`); ``tight``: crop to
        the drawn content (a second layout pass; figures laid out with fixed margins pass
        False).  A pyplot figure is closed.  The PNG is compressed at zlib level 1
        (:data:`PNG_COMPRESS_LEVEL`): a tenth larger than at the default 6, in 0.6 of the time."""
        from cycj.display import tidy

        p = self.path(name)
        tidy(fig)
        fig.savefig(
            p,
            dpi=dpi,
            bbox_inches="tight" if tight else None,
            pil_kwargs={"compress_level": PNG_COMPRESS_LEVEL},
        )
        plt = sys.modules.get("matplotlib.pyplot")
        if plt is not None:
            plt.close(fig)
        return p


#: zlib level of the PNG plots (Pillow's default is 6)
PNG_COMPRESS_LEVEL = 1


def columns_csv(columns: dict) -> str:
    """CSV text of float columns ``{name: array}`` as pandas' ``to_csv(index=False)`` writes
    a DataFrame of them: a header of the names, each number as NumPy's shortest round-trip
    text (``astype(str)``, what pandas uses for float columns without ``float_format``), an
    empty field for NaN, one line per row."""
    import numpy as np

    names = list(columns)
    text = []
    for v in columns.values():
        v = np.asarray(v, dtype=float)
        t = v.astype(str).astype(object)
        t[np.isnan(v)] = ""
        text.append(t)
    lines = [",".join(names), *(",".join(row) for row in zip(*text, strict=True))]
    return "\n".join(lines) + "\n"


def sha256_of(path) -> str:
    import hashlib

    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def provenance(inputs: dict | None = None, files=None, **extra) -> dict:
    """Version, platform, time and SHA-256 of each input file (``{name}_sha256``).

    ``files`` are (role, path) pairs of every further file the run read (a case's table,
    profiles …).  Every file, of ``inputs`` and of ``files``, is listed once under ``files``
    with its role and SHA-256; a file of ``files`` not among ``inputs`` also gets
    ``{role}_sha256`` (``_2``, ``_3`` … when several files share a role)."""
    import numpy as np

    from cycj._version import __version__

    out = {
        "cycj_version": __version__,
        "python": sys.version.split()[0],
        "numpy": np.__version__,
        "platform": platform.platform(),
        "created_utc": datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ"),
    }
    listed, seen = [], set()
    for name, p in (inputs or {}).items():
        if p is not None and Path(p).is_file():
            digest = sha256_of(p)
            out[f"{name}_sha256"] = digest
            out[f"{name}_path"] = str(p)
            seen.add(str(Path(p).resolve()))
            listed.append({"role": name, "path": str(p), "sha256": digest})
    for role, p in files or ():
        p = Path(p)
        if not p.is_file() or str(p.resolve()) in seen:
            continue
        seen.add(str(p.resolve()))
        digest = sha256_of(p)
        listed.append({"role": role, "path": str(p), "sha256": digest})
        key, k = role, 1
        while f"{key}_sha256" in out:
            k += 1
            key = f"{role}_{k}"
        out[f"{key}_sha256"] = digest
        out[f"{key}_path"] = str(p)
    out["files"] = listed
    out.update(extra)
    return out


def record_provenance(summary: dict, inputs: dict | None = None, files=None, **extra) -> dict:
    """Put :func:`provenance` into ``summary["provenance"]`` and copy each input's SHA-256 to
    the top level (``case_sha256``, ``history_sha256``, ``table_sha256`` …); returns
    ``summary``."""
    prov = provenance(inputs, files, **extra)
    summary["provenance"] = prov
    for k, v in prov.items():
        if k.endswith("_sha256"):
            summary[k] = v
    return summary
