"""A small static server for dist/: right types, the app's security headers, loopback only.

Used by `make serve`, by the browser tests (in a thread) and by the benchmark.
As a production static host would, it serves a file's ``.br`` or ``.gz`` twin
(build.py writes both) with its ``Content-Encoding``, picked by the client's
``Accept-Encoding``: brotli when accepted, else gzip, else the file as it is.
A server made with ``record=True`` keeps what it sent (``server.sent``), so the
update test and the benchmark can count what a phone downloaded.

With ``database`` (a CouchDB-protocol server's address, like http://127.0.0.1:5984), requests
under DATABASE_PATH are passed to it, as the plant's reverse proxy does: the app and its
database under one origin, so the page's ``connect-src 'self'`` holds. The browser tests
use it with pouchdb-server; README shows the same for a real CouchDB behind nginx.
"""

from __future__ import annotations

import functools
import http.client
import http.server
import threading
import urllib.parse
from dataclasses import dataclass
from pathlib import Path

TYPES = {
    ".mjs": "text/javascript",
    ".js": "text/javascript",
    ".wasm": "application/wasm",
    ".webmanifest": "application/manifest+json",
    ".whl": "application/zip",
    ".zip": "application/zip",
    ".json": "application/json",
    ".svg": "image/svg+xml",
    ".bin": "application/octet-stream",
}

# The same policy as the page's meta tag; as a header it also covers the worker.
CSP = ("default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; worker-src 'self'; "
       "connect-src 'self'; img-src 'self' data:; style-src 'self'; object-src 'none'; "
       "base-uri 'self'; form-action 'none'; frame-ancestors 'none'")


# Where the database is under the app's origin: /db/<database> is <database> on the server.
DATABASE_PATH = "/db/"
# Headers of one connection, not of the request: never passed on. Accept-Encoding is dropped
# so that the database answers in plain bytes, passed on as they come.
HOP = frozenset({"connection", "keep-alive", "proxy-authenticate", "proxy-authorization",
                 "te", "trailer", "transfer-encoding", "upgrade", "host", "accept-encoding",
                 "content-length"})

# The twins build.py writes, best first, and the Content-Encoding each is sent with.
ENCODINGS = (("br", ".br"), ("gzip", ".gz"))


@dataclass
class Sent:
    """One response: the request's path, its status, the body's bytes and their encoding."""

    path: str
    status: int
    bytes: int = 0
    encoding: str = ""


def accepted(header: str) -> set[str]:
    """The codings an Accept-Encoding header accepts (q > 0), lower case.

    >>> sorted(accepted("gzip, deflate, br;q=0.5, zstd;q=0"))
    ['br', 'deflate', 'gzip']
    """
    found = set()
    for part in header.split(","):
        name, _, params = part.strip().partition(";")
        q = params.strip()
        try:
            weight = float(q[2:]) if q.startswith("q=") else 1.0
        except ValueError:
            weight = 1.0
        if name.strip() and weight > 0:
            found.add(name.strip().lower())
    return found


class Handler(http.server.SimpleHTTPRequestHandler):
    extensions_map = {**http.server.SimpleHTTPRequestHandler.extensions_map, **TYPES}
    quiet = True
    database: str | None = None

    def _to_database(self) -> bool:
        """Pass the request on to the database when it is for it; whether it was."""
        if self.database is None or not self.path.startswith(DATABASE_PATH):
            return False
        where = urllib.parse.urlsplit(self.database)
        length = int(self.headers.get("Content-Length") or 0)
        body = self.rfile.read(length) if length else None
        headers = {k: v for k, v in self.headers.items() if k.lower() not in HOP}
        upstream = http.client.HTTPConnection(where.hostname, where.port, timeout=60)
        try:
            upstream.request(self.command, self.path[len(DATABASE_PATH) - 1:], body=body,
                             headers=headers)
            answer = upstream.getresponse()
            data = answer.read()
        except OSError:
            self.send_error(502, "the database did not answer")
            return True
        finally:
            upstream.close()
        self.send_response(answer.status, answer.reason)
        for key, value in answer.getheaders():
            if key.lower() not in HOP and key.lower() != "cache-control":
                self.send_header(key, value)
        self.send_header("Content-Length", str(len(data)))
        self.end_headers()
        if self.command != "HEAD":
            self.wfile.write(data)
        return True

    def do_GET(self):
        if not self._to_database():
            super().do_GET()

    def do_HEAD(self):
        if not self._to_database():
            super().do_HEAD()

    def _database_only(self):
        if not self._to_database():
            self.send_error(405, "only the database takes this method")

    do_PUT = do_POST = do_DELETE = _database_only

    def send_response(self, code, message=None):
        self._sent = Sent(self.path, code)
        super().send_response(code, message)

    def send_header(self, keyword, value):
        if hasattr(self, "_sent"):
            if keyword.lower() == "content-length":
                self._sent.bytes = int(value)
            elif keyword.lower() == "content-encoding":
                self._sent.encoding = value
        super().send_header(keyword, value)

    def end_headers(self):
        self.send_header("Content-Security-Policy", CSP)
        self.send_header("X-Content-Type-Options", "nosniff")
        self.send_header("Cache-Control", "no-cache")
        super().end_headers()
        if getattr(self.server, "sent", None) is not None and hasattr(self, "_sent"):
            if self._sent.status == 304:
                self._sent.bytes = 0
            self.server.sent.append(self._sent)

    def _twin(self, path: Path) -> tuple[str, Path] | None:
        """The encoding and twin to send for `path`, if the client accepts one that is current."""
        if not path.is_file():
            return None
        wanted = accepted(self.headers.get("Accept-Encoding", ""))
        for encoding, suffix in ENCODINGS:
            twin = path.with_name(path.name + suffix)
            # A twin older than its file is stale (the file was edited after the build): skip it.
            if encoding in wanted and twin.is_file() and twin.stat().st_mtime >= path.stat().st_mtime:
                return encoding, twin
        return None

    def send_head(self):
        path = Path(self.translate_path(self.path))
        if path.is_dir() and self.path.split("?", 1)[0].endswith("/"):
            path = path / "index.html"  # the folder's page, twins and all
        chosen = self._twin(path)
        if chosen is None:
            return super().send_head()
        encoding, twin = chosen
        modified = self.date_time_string(int(twin.stat().st_mtime))
        if self.headers.get("If-Modified-Since") == modified:
            self.send_response(304)  # what the client holds is current
            self.send_header("Vary", "Accept-Encoding")
            self.end_headers()
            return None
        handle = open(twin, "rb")
        self.send_response(200)
        self.send_header("Last-Modified", modified)
        self.send_header("Content-Type", self.guess_type(str(path)))
        self.send_header("Content-Encoding", encoding)
        self.send_header("Content-Length", str(twin.stat().st_size))
        self.send_header("Vary", "Accept-Encoding")
        self.end_headers()
        return handle

    def log_message(self, format, *args):  # noqa: A002 - the base class's name
        if not self.quiet:
            super().log_message(format, *args)


def make_server(root: Path, port: int = 0, quiet: bool = True, record: bool = False,
                database: str | None = None) -> http.server.ThreadingHTTPServer:
    handler = functools.partial(
        type("QuietHandler", (Handler,), {"quiet": quiet, "database": database}),
        directory=str(root))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", port), handler)
    server.daemon_threads = True
    server.sent = [] if record else None
    return server


def start_in_thread(root: Path, port: int = 0, record: bool = False,
                    database: str | None = None) -> tuple[http.server.ThreadingHTTPServer, str]:
    """A running server and its base URL; call ``server.shutdown()`` when done."""
    server = make_server(root, port, record=record, database=database)
    threading.Thread(target=server.serve_forever, daemon=True).start()
    return server, f"http://127.0.0.1:{server.server_address[1]}/"


def serve_forever(root: Path, port: int = 8000, database: str | None = None) -> None:
    server = make_server(root, port, quiet=False, database=database)
    print(f"Sumpside is served at http://127.0.0.1:{server.server_address[1]}/  (Ctrl+C stops)",
          flush=True)
    if database:
        print(f"  {DATABASE_PATH}<name> is passed to the database at {database}", flush=True)
    try:
        server.serve_forever()
    except KeyboardInterrupt:
        pass
    finally:
        server.server_close()
