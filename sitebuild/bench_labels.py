"""The benchmark's label row: how large a QR code a machine's label needs.

A label's code holds the app's own address with the card in its fragment
(calc.machines.label), drawn as the page draws it (site_src/py/qr_label.py: segno, the
lowest error correction that fits, raised where the version allows). The target (issue 16)
is at most version 15 for a typical card, readable from a printed 4 cm square. Typical here
means each of the demo plant's three cards; the largest is the first of them with every
other field of the card filled too (REST: invented values, as demo data is, checked by the
card's own parser). The address is an invented plant's, of an ordinary length (ADDRESS). Nothing
is timed; nothing here asserts anything.

    python -m sitebuild.bench_labels      (from the repository's root)
"""

from __future__ import annotations

import argparse
import importlib.util
import json
from datetime import date
from pathlib import Path

from calc.machines import card, demo, label

ROOT = Path(__file__).resolve().parent.parent
# Where an invented plant serves the app: a label's code is this address and the fragment.
ADDRESS = "https://reliability.plant.example/sumpside/"
DAY = date(2026, 6, 1)
TARGET_VERSION = 15
# The card fields no demo card fills, with invented values (demo data, not a real oil's).
REST = {"kv40_new": "46.2", "kv100_new": "6.9", "cal_temp1": "20", "cal_ppm1": "90",
        "cal_temp2": "60", "cal_ppm2": "380", "bends_90": "1", "elbows_45": "1", "tees": "1",
        "tank_volume": "1150", "oil_volume": "890", "target4": "18", "target6": "16",
        "target14": "13"}


def _drawer():
    """site_src/py/qr_label.py, the module the worker draws labels with, loaded as it is."""
    spec = importlib.util.spec_from_file_location("qr_label", ROOT / "site_src" / "py" / "qr_label.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _fullest(record: dict) -> dict:
    """`record` with every field its label carries filled: its own values, then REST's (parsed, so valid)."""
    raw = {key: str(value) for key, value in record["card"].items() if value is not None}
    filled = card.parse({**REST, **raw})
    # Its tank is rectangular: a diameter is the one field it cannot have.
    missing = set(label.LABEL_KEYS) - set(filled) - {"tank_diameter"}
    assert not missing, f"bench_labels.REST lacks {sorted(missing)}"
    return {**record, "card": filled}


def label_row() -> dict:
    drawer = _drawer()
    machines = demo.plant(DAY)["machines"]
    cases = [(m["card"]["name"], m) for m in machines]
    cases.append((f"{machines[0]['card']['name']}, every field filled", _fullest(machines[0])))
    rows = []
    for name, record in cases:
        text = ADDRESS + label.ROUTE + label.fragment(record)
        drawn = json.loads(drawer.svg_json(json.dumps({"text": text})))
        rows.append({"card": name, "chars": len(text), "version": drawn["version"],
                     "error": drawn["error"], "fields": sum(v is not None for v in record["card"].values())})
    typical = max(r["version"] for r in rows[:-1])
    return {"address": ADDRESS, "target_version": TARGET_VERSION, "typical_version": typical,
            "largest_version": rows[-1]["version"], "rows": rows}


def table(row: dict) -> str:
    lines = [f"Labels: the QR code of each card's address ({row['address']} and the card; "
             f"target version {row['target_version']} at most)",
             f"| {'card':<36} | {'fields':>6} | {'chars':>5} | {'version':>7} | {'correction':>10} |",
             "|" + "|".join("-" * w for w in (38, 8, 7, 9, 12)) + "|"]
    for r in row["rows"]:
        lines.append(f"| {r['card']:<36} | {r['fields']:>6} | {r['chars']:>5} | {r['version']:>7} "
                     f"| {r['error']:>10} |")
    return "\n".join(lines)


def main(argv: list[str] | None = None) -> int:
    argparse.ArgumentParser(description=__doc__.splitlines()[0]).parse_args(argv)
    print(table(label_row()))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
