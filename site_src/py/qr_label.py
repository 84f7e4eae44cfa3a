"""The QR code printed on a machine's label, drawn by segno.

segno is a pure-Python QR library from PyPI; the build packs its wheel into the Pyodide
lock beside the calc wheel, and the snapshot imports it, so a label draws offline. calc
stays standard-library only: it makes the text to encode (calc.machines.label), this module
only draws it. The page asks through the worker ("qr"); the answer is JSON, like calc's.
"""

import json

import segno

# The longest text drawn: a label's address is a few hundred characters (calc.machines.label).
TEXT_MAX_CHARS = 2000


def svg_json(request: str) -> str:
    """``{"text"}`` in; ``{"ok", "svg", "version", "error"}`` out: the code as an SVG sized
    by its viewBox (the page sets the printed size), dark modules on white, four modules of
    quiet zone, at the lowest error correction that fits, raised where the version allows.
    Never raises: a refusal is ``{"ok": false, "errors": [...]}``."""
    try:
        text = json.loads(request).get("text")
        if not isinstance(text, str) or not 0 < len(text) <= TEXT_MAX_CHARS:
            raise ValueError(f"the text to encode is 1 to {TEXT_MAX_CHARS} characters")
        code = segno.make(text, error="l", boost_error=True, micro=False)
        svg = code.svg_inline(scale=1, border=4, dark="#000", light="#fff", omitsize=True,
                              title="QR code of this machine's card")
        return json.dumps({"ok": True, "svg": svg, "version": code.version,
                           "error": code.error})
    except Exception as err:  # noqa: BLE001 - the page gets words, never a traceback
        return json.dumps({"ok": False, "errors": [{"field": "label",
                                                    "message": f"no QR code drawn: {err}"}]})
