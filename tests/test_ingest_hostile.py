"""Hostile files (issue: "Done when"): each is recorded in ingest_errors with a one-line message
naming the file, the run finishes with exit code 0, and every other file is ingested."""

from __future__ import annotations

import os
import random
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from auditor.ingest.pipeline import ingest_corpus
from auditor.store import Store
from tests.ingest_helpers import config_for, encrypt_pdf, html_page, make_pdf, write_tree

REPO = Path(__file__).resolve().parent.parent
GOOD = {"good.md", "good.txt", "good.html", "good.pdf"}


def build_hostile_corpus(root: Path) -> None:
    pdf = make_pdf(["The hotline takes leak reports day and night."])
    write_tree(
        root,
        {
            "good.md": "# Leaks\n\nReport a leak on the hotline.\n",
            "good.txt": "Meter reading\n\nMeters are read every two months.",
            "good.html": html_page("<main><h1>Outages</h1><p>See the outage map.</p></main>"),
            "good.pdf": pdf,
            "truncated.pdf": pdf[: len(pdf) // 2],
            "locked.pdf": encrypt_pdf(pdf, user_password="s3cret"),
            "zero.txt": b"",
            "junk.html": random.Random(7).randbytes(4096),
            "invalid.txt": b"Rates \xc3\x28 and \x81 more",
            "deep.html": "<html><body>" + "<div>" * 100_000 + "deep" + "</div>" * 100_000 + "</body></html>",
            "big.txt": b"rates " * 400_000,  # 2.4 MB, over the 2 MB limit set below
            "unreadable.md": "# Secret\n\nNobody may read this.\n",
        },
    )
    os.symlink("loop_b.md", root / "loop_a.md")
    os.symlink("loop_a.md", root / "loop_b.md")
    os.symlink(".", root / "again")  # a folder link back to the root
    os.chmod(root / "unreadable.md", 0)


EXPECTED = {  # path -> (kind, words in the message)
    "truncated.pdf": ("parse_error", "truncated"),
    "locked.pdf": ("encrypted", "encrypted PDF"),
    "zero.txt": ("empty", "empty file (0 bytes)"),
    "junk.html": ("not_a_html", "binary data"),
    "invalid.txt": ("parse_error", "neither UTF-8, UTF-16 nor cp1252"),
    "deep.html": ("parse_error", "nested deeper than 512"),
    "big.txt": ("too_large", "file is 2.3 MB, over the 2 MB limit"),
    "loop_a.md": ("unreadable", "symbolic link loop"),
    "loop_b.md": ("unreadable", "symbolic link loop"),
    "again": ("unreadable", "symbolic link loop"),
    "unreadable.md": ("unreadable", "cannot read file (Permission denied)"),
}


def _run_cli(args: list[str], cwd: Path) -> subprocess.CompletedProcess:
    command = [sys.executable, "-c", "from auditor.cli import main; main()", *args]
    if os.geteuid() == 0:
        # root reads any file; drop the capabilities that let it, so "unreadable" is real.
        setpriv = shutil.which("setpriv")
        if setpriv is None:
            pytest.skip("running as root without setpriv: cannot make a file unreadable")
        caps = "-dac_override,-dac_read_search"
        command = [setpriv, f"--inh-caps={caps}", f"--bounding-set={caps}", *command]
    env = dict(os.environ, PYTHONPATH=str(REPO))
    return subprocess.run(command, cwd=cwd, env=env, capture_output=True, text=True, timeout=300)


def test_hostile_files_are_recorded_and_the_rest_ingested(tmp_path):
    root = tmp_path / "kb"
    build_hostile_corpus(root)
    (tmp_path / "audit.toml").write_text("[corpus]\nfollow_symlinks = true\nmax_file_mb = 2\ntimeout_s = 120\n")
    result = _run_cli(
        ["ingest", str(root), "-c", str(tmp_path / "audit.toml"), "--db", str(tmp_path / "a.db"), "-q"], tmp_path
    )
    assert result.returncode == 0, result.stderr
    assert (
        result.stdout.strip().splitlines()[-1]
        == f"{len(GOOD)} new, 0 changed, 0 unchanged, 0 removed, {len(EXPECTED)} failed"
    )
    with Store(tmp_path / "a.db") as store:
        docs = {r["path"]: r["status"] for r in store.query("SELECT path, status FROM documents")}
        assert docs == {p: "active" for p in GOOD}
        assert all(
            store.query(
                "SELECT count(*) AS n FROM passages p JOIN documents d ON d.id = p.document_id WHERE d.path = ?", [p]
            )[0]["n"]
            > 0
            for p in GOOD
        )
        errors = {r["path"]: r for r in store.query("SELECT * FROM ingest_errors")}
    assert set(errors) == set(EXPECTED)
    for path, (kind, words_) in EXPECTED.items():
        row = errors[path]
        assert row["kind"] == kind, (path, row)
        assert row["error"].startswith(repr(str(root / path)) + ": "), row["error"]
        assert words_ in row["error"], row["error"]
        assert "\n" not in row["error"]
        assert row["source_root"] == str(root)
        # The CLI names each failure on stderr.
        assert row["error"] in result.stderr


def test_links_are_not_followed_by_default(tmp_path):
    root = tmp_path / "kb"
    outside = tmp_path / "outside.md"
    outside.write_text("# Outside\n\nNot part of the corpus.\n")
    write_tree(root, {"inside.md": "# Inside\n\nPart of the corpus.\n"})
    os.symlink(outside, root / "outside-link.md")
    os.symlink("inside.md", root / "inside-link.md")
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config_for(root))
        errors = {r["path"]: (r["kind"], r["error"]) for r in store.query("SELECT * FROM ingest_errors")}
        assert summary.line() == "1 new, 0 changed, 0 unchanged, 0 removed, 2 failed"
        assert errors["inside-link.md"] == (
            "symlink",
            f"{str(root / 'inside-link.md')!r}: symbolic link not followed (corpus.follow_symlinks is false)",
        )
        # Followed inside the root, never out of it.
        summary = ingest_corpus(store, config_for(root, follow_symlinks=True))
        errors = {r["path"]: (r["kind"], r["error"]) for r in store.query("SELECT * FROM ingest_errors")}
        assert set(errors) == {"outside-link.md"}
        assert errors["outside-link.md"][0] == "symlink" and "outside the source root" in errors["outside-link.md"][1]
        # A link to a file already found is that file: ingested once, under its own path.
        assert {r["path"]: r["status"] for r in store.query("SELECT path, status FROM documents")} == {
            "inside.md": "active"
        }


def test_fifo_is_never_opened(tmp_path):
    root = tmp_path / "kb"
    write_tree(root, {"a.md": "# A\n\nText.\n"})
    os.mkfifo(root / "pipe.txt")  # opening it for reading would block for ever
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config_for(root))
    assert summary.new == 1 and summary.failures[0]["kind"] == "unreadable"
    assert "not a regular file" in summary.errors[0]


def test_missing_corpus_path_is_an_input_error_and_changes_nothing(tmp_path):
    from auditor.errors import InputError

    root = tmp_path / "kb"
    write_tree(root, {"a.md": "# A\n\nText.\n"})
    with Store(tmp_path / "a.db") as store:
        ingest_corpus(store, config_for(root))
        with pytest.raises(InputError, match="corpus path not found"):
            ingest_corpus(store, config_for(root), paths=[tmp_path / "unmounted"])
        assert store.query("SELECT status FROM documents") == [{"status": "active"}]


def test_a_linked_folder_is_ingested_once_under_its_own_path(tmp_path):
    root = write_tree(tmp_path / "kb", {"docs/guide.md": "# Guide\n\nText.\n", "docs/sub/more.md": "# More\n\nText.\n"})
    os.symlink("docs", root / "alias")  # sorts before "docs"
    os.symlink("..", root / "docs" / "sub" / "up")  # a link to an ancestor: a loop
    with Store(tmp_path / "a.db") as store:
        summary = ingest_corpus(store, config_for(root, follow_symlinks=True))
        assert sorted(r["path"] for r in store.query("SELECT path FROM documents")) == [
            "docs/guide.md",
            "docs/sub/more.md",
        ]
        assert summary.failures == [
            {
                "path": "docs/sub/up",
                "kind": "unreadable",
                "error": f"{str(root / 'docs/sub/up')!r}: symbolic link loop, not followed",
            }
        ]
