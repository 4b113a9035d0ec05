"""Discovery of the corpus files: roots, include/exclude globs, safety, hashing, type detection.

Safety rules (why: a knowledge-base export is untrusted input, and a cron job must finish):
* hidden files and folders (name starting with ".") are skipped;
* symbolic links are not followed unless `corpus.follow_symlinks` is true, and never out of the
  source root either way; a link that is not followed is recorded, so no file is dropped silently;
  a link loop is recorded as such;
* anything that is not a regular file (FIFO, device, socket) is recorded, never opened;
* a file over `corpus.max_file_mb` is recorded as too_large without being read.

Document paths: with one source root, a document's path is relative to that root. With several
roots, paths are relative to the roots' common parent folder (roots /kb/billing and /kb/field give
"billing/x.md" and "field/y.md"), which keeps them unique. Globs (include, exclude, owners) always
match the path relative to the file's own source root.
"""

from __future__ import annotations

import hashlib
import os
import re
import stat
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from auditor.errors import InputError
from auditor.ingest.failures import IngestFailure
from auditor.ingest.text import sniff_bom, utf16_without_bom

# Extensions we parse; content (magic bytes) has the last word (see detect_kind).
EXTENSIONS = {
    ".pdf": "pdf",
    ".html": "html",
    ".htm": "html",
    ".xhtml": "html",
    ".shtml": "html",
    ".md": "markdown",
    ".markdown": "markdown",
    ".mdown": "markdown",
    ".mkd": "markdown",
    ".txt": "text",
    ".text": "text",
}
KINDS = ("pdf", "html", "markdown", "text")
# Binary formats that are sometimes misnamed; matched against the first bytes.
_BINARY_MAGIC = [
    (b"\x89PNG", "a PNG image"),
    (b"\xff\xd8\xff", "a JPEG image"),
    (b"GIF8", "a GIF image"),
    (b"PK\x03\x04", "a ZIP archive (or an Office document)"),
    (b"\x1f\x8b", "a gzip file"),
    (b"\x7fELF", "an ELF executable"),
    (b"\xd0\xcf\x11\xe0", "an OLE2 (old Office) document"),
    (b"BZh", "a bzip2 file"),
    (b"\xfd7zXZ\x00", "an xz file"),
    (b"7z\xbc\xaf", "a 7-Zip archive"),
]


@dataclass(frozen=True)
class SourceFile:
    """A file found under a source root."""

    file: Path  # as found (root / relative), not resolved
    root: Path
    rel: str  # POSIX path relative to its own root (what globs match)
    doc_path: str  # the document identity (see module docstring)
    size: int
    mtime: float
    kind: str  # from the extension; detect_kind decides from the content


@dataclass(frozen=True)
class SkippedFile:
    """A file found but not ingestable, recorded in ingest_errors."""

    file: Path
    root: Path
    doc_path: str
    kind: str
    message: str


@lru_cache(maxsize=512)
def _glob_regex(pattern: str) -> re.Pattern:
    # "**/" spans any number of folders, "*" and "?" stay inside one path segment.
    out, i = [], 0
    while i < len(pattern):
        if pattern.startswith("**/", i):
            out.append("(?:.*/)?")
            i += 3
        elif pattern.startswith("**", i):
            out.append(".*")
            i += 2
        elif pattern[i] == "*":
            out.append("[^/]*")
            i += 1
        elif pattern[i] == "?":
            out.append("[^/]")
            i += 1
        else:
            out.append(re.escape(pattern[i]))
            i += 1
    return re.compile("".join(out) + r"\Z")


def glob_match(pattern: str, rel: str) -> bool:
    """Match a POSIX relative path. A pattern without "/" matches the file name at any depth
    (as in .gitignore); otherwise it matches the whole path, "**" spanning folders."""
    if "/" not in pattern:
        return bool(_glob_regex(pattern).match(rel.rsplit("/", 1)[-1]))
    return bool(_glob_regex(pattern.lstrip("/")).match(rel))


def _doc_paths_base(roots: list[Path]) -> Path:
    if len(roots) == 1:
        return roots[0]
    return Path(os.path.commonpath([str(r) for r in roots]))


def resolve_roots(paths) -> list[tuple[Path, Path | None]]:
    """Corpus paths -> (root folder, single file or None). A missing path is an InputError: an
    ingest must not mark a whole corpus removed because a mount point is absent."""
    roots: list[tuple[Path, Path | None]] = []
    for given in paths:
        p = Path(given).expanduser().absolute()
        if p.is_dir():
            roots.append((p, None))
        elif p.is_file():
            roots.append((p.parent, p))
        else:
            raise InputError(f"{str(given)!r}: corpus path not found (check corpus.paths or the PATH arguments)")
    return roots


def discover(paths, corpus) -> tuple[list[SourceFile], list[SkippedFile]]:
    """Every candidate file under `paths`, and the files that are recorded instead of parsed.

    Files whose extension is not one we parse are ignored unless their content is a PDF.
    """
    roots = resolve_roots(paths)
    base = _doc_paths_base([r for r, _ in roots])
    limit = int(corpus.max_file_mb * 1024 * 1024)
    found: dict[str, SourceFile] = {}
    skipped: dict[str, SkippedFile] = {}
    seen_real: set[str] = set()

    def doc_path(file: Path) -> str:
        return storable(Path(os.path.relpath(file, base)).as_posix())

    def skip(file: Path, root: Path, kind: str, message: str) -> None:
        dp = doc_path(file)
        if dp not in found:
            skipped.setdefault(dp, SkippedFile(file, root, dp, kind, f"{str(file)!r}: {message}"))

    for root, single in roots:
        real_root = os.path.realpath(root)
        stack = [root] if single is None else []
        linked: list[Path] = []  # folders reached through a link: walked after the real tree
        visited_dirs = {real_root}
        files: list[tuple[bool, Path]] = [(False, single)] if single else []  # (via a link, path)
        via_link = False
        while stack or linked:
            if not stack:
                folder, via_link = linked.pop(0), True
                if os.path.realpath(folder) in visited_dirs:
                    continue  # the same folder, already walked under its own path
                visited_dirs.add(os.path.realpath(folder))
                stack.append(folder)
            folder = stack.pop()
            try:
                entries = sorted(os.scandir(folder), key=lambda e: e.name)
            except OSError as exc:
                skip(Path(folder), root, "unreadable", f"cannot list folder ({exc.strerror})")
                continue
            for entry in entries:
                if entry.name.startswith("."):
                    continue
                path = Path(entry.path)
                if entry.is_symlink():
                    target = os.path.realpath(path)
                    if not corpus.follow_symlinks:
                        # Record links to folders and to files we would parse; a link to an image
                        # is no more news than the image itself.
                        if (os.path.isdir(path) or path.suffix.lower() in EXTENSIONS) and _wanted(path, root, corpus):
                            skip(path, root, "symlink", "symbolic link not followed (corpus.follow_symlinks is false)")
                        continue
                    try:
                        os.stat(path)
                    except OSError as exc:
                        loop = exc.errno == 40  # ELOOP
                        skip(
                            path,
                            root,
                            "unreadable",
                            "symbolic link loop, not followed" if loop else f"broken symbolic link ({exc.strerror})",
                        )
                        continue
                    if os.path.commonpath([target, real_root]) != real_root:
                        skip(path, root, "symlink", "symbolic link points outside the source root; not followed")
                        continue
                    if os.path.isdir(target):
                        here = os.path.realpath(folder)
                        if os.path.commonpath([target, here]) == target:  # points at itself or above
                            skip(path, root, "unreadable", "symbolic link loop, not followed")
                        else:
                            linked.append(path)
                        continue
                    files.append((True, path))
                elif entry.is_dir(follow_symlinks=False):
                    visited_dirs.add(os.path.realpath(path))
                    stack.append(path)
                else:
                    files.append((via_link, path))
        # Files reached without links first, so a file reached both ways keeps its own path.
        for file in [p for _, p in sorted(files, key=lambda item: (item[0], str(item[1])))]:
            if single is None and not _wanted(file, root, corpus):
                continue
            real = os.path.realpath(file)
            if real in seen_real:  # nested roots, or a link to a file already found: ingest it once
                continue
            try:
                st = os.stat(file)
            except OSError as exc:
                skip(file, root, "unreadable", f"cannot read file ({exc.strerror})")
                continue
            rel = Path(os.path.relpath(file, root)).as_posix()
            kind = EXTENSIONS.get(file.suffix.lower())
            if not stat.S_ISREG(st.st_mode):
                if kind:
                    skip(file, root, "unreadable", "not a regular file (FIFO, device or socket); not opened")
                continue
            if kind is None and not _looks_like_pdf(file):
                continue
            seen_real.add(real)
            if st.st_size > limit:
                skip(
                    file,
                    root,
                    "too_large",
                    f"file is {st.st_size / 1048576:.1f} MB, over the {corpus.max_file_mb:g} MB limit (corpus.max_file_mb)",
                )
                continue
            dp = doc_path(file)
            skipped.pop(dp, None)
            found[dp] = SourceFile(file, root, rel, dp, st.st_size, st.st_mtime, kind or "pdf")
    return sorted(found.values(), key=lambda f: f.doc_path), sorted(skipped.values(), key=lambda s: s.doc_path)


def storable(path: str) -> str:
    """`path` as SQLite TEXT can hold it: bytes of a file name that are not UTF-8 (which Python
    keeps as surrogate escapes) become backslash escapes, "caf\\xe9.md"."""
    try:
        path.encode("utf-8")
        return path
    except UnicodeEncodeError:
        return os.fsencode(path).decode("utf-8", "backslashreplace")


def _wanted(path: Path, root: Path, corpus) -> bool:
    rel = Path(os.path.relpath(path, root)).as_posix()
    if not any(glob_match(p, rel) for p in corpus.include):
        return False
    return not any(glob_match(p, rel) for p in corpus.exclude)


def _looks_like_pdf(path: Path) -> bool:
    try:
        with open(path, "rb") as handle:
            return b"%PDF-" in handle.read(1024)
    except OSError:
        return False


def read_file(file: Path, doc_path: str) -> bytes:
    """The file's bytes, or IngestFailure('unreadable')."""
    try:
        with open(file, "rb") as handle:
            return handle.read()
    except OSError as exc:
        raise IngestFailure("unreadable", str(file), f"cannot read file ({exc.strerror})") from None


def sha256(data: bytes) -> str:
    return hashlib.sha256(data).hexdigest()


def detect_kind(data: bytes, declared: str, file: str) -> str:
    """The parser for `data`, from its content first (magic bytes), the extension second.

    ISO 32000-1 §7.5.2: a PDF starts with "%PDF-" (readers accept it within the first 1024 bytes).
    A file named .pdf without it, or a text-type file holding a known binary format, is refused
    as not_a_<kind>; text-type files that are really PDFs are parsed as PDFs.
    """
    if not data:
        raise IngestFailure("empty", file, "empty file (0 bytes)")
    head = data[:1024]
    if b"%PDF-" in head:
        return "pdf"
    if declared == "pdf":
        raise IngestFailure("not_a_pdf", file, "named .pdf but not a PDF (no %PDF- header)")
    for magic, what in _BINARY_MAGIC:
        if data.startswith(magic):
            raise IngestFailure(f"not_a_{declared}", file, f"named as {declared} but the content is {what}")
    if not sniff_bom(head) and not utf16_without_bom(data):
        sample = data[:8192]
        controls = sum(sample.count(bytes([b])) for b in _BINARY_BYTES)
        if controls > max(1, len(sample) // 200):  # text has (almost) none of these
            raise IngestFailure(
                f"not_a_{declared}",
                file,
                f"binary data, not {declared} ({controls} control bytes in the first {len(sample)})",
            )
    return declared


# C0 control bytes other than tab, LF, FF, CR and ESC.
_BINARY_BYTES = [b for b in range(32) if b not in (9, 10, 12, 13, 27)]
