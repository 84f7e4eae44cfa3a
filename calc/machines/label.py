"""A machine's card as the fragment of the app's own address, for the QR code on its label.

A label on the tank carries the card so that a phone's camera opens the app (offline once
installed) with the card ready to add or to update. The fragment (after ``#``) never
reaches a server. It is compact and versioned:

    #/label/1.<base64url of raw deflate of JSON [id, rev, updated, [value, ...]]>

where the values stand in the order of LABEL_KEYS (version 1's list of card fields, frozen
here: a card field added later needs a new version, never a reordering), trailing blanks
left out. The card's notes stay on the phone: a label holds the facts, not the diary.

What comes back from a label is data only: decoded with bounded sizes, its card parsed by
`card.parse` like any typed card (every bad field named), shown as text, never run.

>>> from calc.machines import records
>>> made = records.new_machine({"name": "Press 3, west bay", "grade": "VG 46"}, "metric",
...                            "2026-03-04T09:15:00+01:00", "m3")
>>> text = fragment(made)
>>> text.startswith("1.") and len(text) < 200
True
>>> back = read(text)
>>> back["id"], back["card"]["name"], back["card"]["grade"], back["rev"] == made["rev"]
('m3', 'Press 3, west bay', 'VG 46', True)
"""

from __future__ import annotations

import base64
import binascii
import json
import zlib

from ..kernel.errors import InputError
from ..kernel.result import Q
from . import card as cards
from . import records

LABEL_VERSION = 1
ROUTE = "#/label/"
# Version 1's card fields, in the order their values are written (notes left out).
LABEL_KEYS = (
    "name", "site", "oil_name", "grade", "vi", "kv40_new", "kv100_new", "an_new", "oil_family",
    "cal_temp1", "cal_ppm1", "cal_temp2", "cal_ppm2", "density", "tank_shape", "tank_length",
    "tank_width", "tank_height", "tank_diameter", "working_level", "low_level", "tank_volume",
    "oil_volume", "application", "pump_type", "pump_flow", "pump_min_inlet", "visc_start",
    "visc_opt_high", "visc_opt_low", "visc_min", "suction_bore", "suction_length",
    "suction_head", "entry", "elbows_90", "bends_90", "elbows_45", "tees", "suction_valve",
    "strainer", "strainer_bypass", "bypass_opens", "working_pressure", "component", "target4",
    "target6", "target14", "temp_cold_start", "temp_running", "temp_hottest", "ambient",
    "sample_days", "filter_days", "filter_changed", "oil_days", "oil_changed",
)
LEFT_OFF = ("notes",)
# A label's text is short (a QR code of version 15 holds at most 520 bytes); anything far
# longer is not a label, and its inflated content is held to a bound (no zip bomb).
FRAGMENT_MAX_CHARS = 2000
INFLATED_MAX_BYTES = 20000
URL_SAFE_ALPHABET = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_"
# What the printed label says beside the code, in words (and the cleanliness target).
WORDS = ("name", "site", "oil_name", "grade")


def _number(value: float) -> float | int:
    """The shortest JSON for a card value: a whole number without its ``.0``."""
    return int(value) if float(value).is_integer() and abs(value) < 1e15 else value


def fragment(machine: dict) -> str:
    """The label's fragment (after ``#/label/``) of a machine record."""
    card = machine["card"]
    values = [None if card.get(k) is None else
              _number(card[k]) if isinstance(card[k], float) else card[k] for k in LABEL_KEYS]
    while values and values[-1] is None:
        values.pop()
    text = json.dumps([machine["id"], machine.get("rev"), machine.get("updated"), values],
                      separators=(",", ":"), ensure_ascii=False)
    packer = zlib.compressobj(9, zlib.DEFLATED, -15)
    packed = packer.compress(text.encode("utf-8")) + packer.flush()
    return f"{LABEL_VERSION}." + base64.urlsafe_b64encode(packed).decode("ascii").rstrip("=")


def _refused(why: str) -> InputError:
    return InputError("label", "is not a Sumpside machine label: {why}", why=Q(why, "text"))


def _unpacked(text: object) -> list:
    if not isinstance(text, str) or len(text) > FRAGMENT_MAX_CHARS:
        raise _refused("its text is missing or far too long")
    version, dot, body = text.partition(".")
    if not dot or version != str(LABEL_VERSION):
        raise _refused(f"version {version[:8]!r} is not one this app reads (it reads "
                       f"{LABEL_VERSION}); update the app")
    undecodable = _refused("its code does not decode (cut short, or not from this app)")
    if body.strip(URL_SAFE_ALPHABET):
        raise undecodable
    try:
        packed = base64.urlsafe_b64decode(body + "=" * (-len(body) % 4))
        inflater = zlib.decompressobj(-15)
        raw = inflater.decompress(packed, INFLATED_MAX_BYTES)
    except (binascii.Error, zlib.error, ValueError):
        raise undecodable from None
    if inflater.unconsumed_tail or not inflater.eof:
        raise _refused("it is cut short or far too large")
    try:
        found = json.loads(raw.decode("utf-8"))
    except (UnicodeDecodeError, ValueError, RecursionError):
        raise undecodable from None
    if not (isinstance(found, list) and len(found) == 4 and isinstance(found[3], list)
            and len(found[3]) <= len(LABEL_KEYS)):
        raise _refused("its content is not a card")
    return found


def read(text: object) -> dict:
    """The machine record a label's fragment holds, checked as a record from outside calc
    (`records.checked_machine`: the card parsed again, every bad field named)."""
    machine_id, rev, updated, values = _unpacked(text)
    card = {k: v for k, v in zip(LABEL_KEYS, values) if v is not None}
    record = {"format": records.MACHINE, "version": records.VERSION, "id": machine_id,
              "rev": rev, "history": [], "updated": updated, "card": card}
    return records.checked_machine(record)


def words(machine: dict, system: str) -> list[dict]:
    """What the printed label says beside its code: the name, site, oil, grade and
    cleanliness target, as the card's summary words them, in `system` units."""
    lines = [{"label": line["label"], "text": line["text"]}
             for line in cards.summary(machine["card"], system) if line["key"] in WORDS]
    found = cards.facts(machine["card"])[0]
    code = [found.get(k) for k in ("target4", "target6", "target14")]
    if any(c is not None for c in code):
        lines.append({"label": "Cleanliness target, ISO 4406",
                      "text": "/".join("–" if c is None else f"{c:g}" for c in code)})
    return lines
