"""The local server picks a file's twin by Accept-Encoding as a static host does, and keeps
what it sent when asked to."""

from __future__ import annotations

import gzip
import os
import urllib.request

import brotli
import pytest

from sitebuild import serve

BODY = b"<p>" + b"sump " * 2000 + b"</p>"


@pytest.fixture
def site(tmp_path):
    page = tmp_path / "page.html"
    page.write_bytes(BODY)
    (tmp_path / "page.html.br").write_bytes(brotli.compress(BODY))
    (tmp_path / "page.html.gz").write_bytes(gzip.compress(BODY, mtime=0))
    server, base = serve.start_in_thread(tmp_path, record=True)
    yield tmp_path, base, server.sent
    server.shutdown()


def _get(url: str, accept: str | None):
    request = urllib.request.Request(url, headers={"Accept-Encoding": accept} if accept else {})
    with urllib.request.urlopen(request) as response:
        return response.headers.get("Content-Encoding"), response.headers.get("Vary"), response.read()


@pytest.mark.parametrize("accept, encoding", [
    ("gzip, deflate, br, zstd", "br"),       # what Chromium sends
    ("gzip, deflate", "gzip"),
    ("br;q=0, gzip", "gzip"),                # refused outright
    ("identity", None),
    (None, None),
])
def test_picks_the_twin_the_client_accepts(site, accept, encoding):
    _, base, sent = site
    got, vary, body = _get(base + "page.html", accept)
    assert got == encoding
    decoded = {"br": brotli.decompress, "gzip": gzip.decompress, None: bytes}[encoding](body)
    assert decoded == BODY
    assert (vary == "Accept-Encoding") == (encoding is not None)
    assert [(s.path, s.status, s.bytes, s.encoding) for s in sent] == [
        ("/page.html", 200, len(body), encoding or "")]


def test_a_folder_is_served_its_page_twin(site):
    folder, base, _ = site
    (folder / "page.html").rename(folder / "index.html")
    for suffix in (".br", ".gz"):
        (folder / f"page.html{suffix}").rename(folder / f"index.html{suffix}")
    encoding, _, body = _get(base, "gzip, br")
    assert encoding == "br" and brotli.decompress(body) == BODY


def test_a_twin_older_than_its_file_is_not_served(site):
    folder, base, _ = site
    stale = folder / "page.html.br"
    older = (folder / "page.html").stat().st_mtime - 60
    os.utime(stale, (older, older))
    assert _get(base + "page.html", "br, gzip")[0] == "gzip"
