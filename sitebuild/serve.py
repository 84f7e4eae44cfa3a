"""A small static server for dist/: right types, the app's security headers, loopback only.

Used by `make serve`, by the browser tests (in a thread) and by the benchmark.
It serves a file's ``.gz`` twin with ``Content-Encoding: gzip`` when the
client accepts it, as a production static host would.
"""

from __future__ import annotations

import functools
import http.server
import threading
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


class Handler(http.server.SimpleHTTPRequestHandler):
    extensions_map = {**http.server.SimpleHTTPRequestHandler.extensions_map, **TYPES}
    quiet = True

    def end_headers(self):
        self.send_header("Content-Security-Policy", CSP)
        self.send_header("X-Content-Type-Options", "nosniff")
        self.send_header("Cache-Control", "no-cache")
        super().end_headers()

    def send_head(self):
        path = Path(self.translate_path(self.path))
        gz = path.with_name(path.name + ".gz")
        # A twin older than its file is stale (the file was edited after the build): skip it.
        if (path.is_file() and gz.is_file() and gz.stat().st_mtime >= path.stat().st_mtime
                and "gzip" in self.headers.get("Accept-Encoding", "")):
            modified = self.date_time_string(int(gz.stat().st_mtime))
            if self.headers.get("If-Modified-Since") == modified:
                self.send_response(304)  # what the client holds is current
                self.send_header("Vary", "Accept-Encoding")
                self.end_headers()
                return None
            handle = open(gz, "rb")
            self.send_response(200)
            self.send_header("Last-Modified", modified)
            self.send_header("Content-Type", self.guess_type(str(path)))
            self.send_header("Content-Encoding", "gzip")
            self.send_header("Content-Length", str(gz.stat().st_size))
            self.send_header("Vary", "Accept-Encoding")
            self.end_headers()
            return handle
        return super().send_head()

    def log_message(self, format, *args):  # noqa: A002 - the base class's name
        if not self.quiet:
            super().log_message(format, *args)


def make_server(root: Path, port: int = 0, quiet: bool = True) -> http.server.ThreadingHTTPServer:
    handler = functools.partial(type("QuietHandler", (Handler,), {"quiet": quiet}),
                                directory=str(root))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", port), handler)
    server.daemon_threads = True
    return server


def start_in_thread(root: Path, port: int = 0) -> tuple[http.server.ThreadingHTTPServer, str]:
    """A running server and its base URL; call ``server.shutdown()`` when done."""
    server = make_server(root, port)
    threading.Thread(target=server.serve_forever, daemon=True).start()
    return server, f"http://127.0.0.1:{server.server_address[1]}/"


def serve_forever(root: Path, port: int = 8000) -> None:
    server = make_server(root, port, quiet=False)
    print(f"Sumpside is served at http://127.0.0.1:{server.server_address[1]}/  (Ctrl+C stops)",
          flush=True)
    try:
        server.serve_forever()
    except KeyboardInterrupt:
        pass
    finally:
        server.server_close()
