"""The label's QR code, drawn by the page's own module (site_src/py/qr_label.py, segno) and
read back by zxing-cpp (a barcode reader from PyPI, used in tests only): it holds the app's
address with the card, and stays small enough to read from a printed 4 cm square."""

import io
import json
import sys
from datetime import date
from pathlib import Path

import pytest

segno = pytest.importorskip("segno")
zxingcpp = pytest.importorskip("zxingcpp")
Image = pytest.importorskip("PIL.Image")

from calc.machines import demo, label  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parents[2] / "site_src" / "py"))
import qr_label  # noqa: E402

# A typical plant address for the app (invented); the demo plant's cards are full ones.
APP = "https://maintenance.plant.example/sumpside/"
# The target: version 15 at most (77 modules: 0.52 mm a module in 4 cm).
VERSION_MAX = 15


def _read_back(text: str) -> tuple[str, int]:
    code = segno.make(text, error="l", boost_error=True, micro=False)
    out = io.BytesIO()
    code.save(out, kind="png", scale=4, border=4)
    found = zxingcpp.read_barcodes(Image.open(io.BytesIO(out.getvalue())))
    assert len(found) == 1 and found[0].format == zxingcpp.BarcodeFormat.QRCode
    return found[0].text, code.version


@pytest.mark.parametrize("machine", demo.plant(date(2026, 3, 4))["machines"], ids=lambda m: m["card"]["name"])
def test_the_code_reads_back_as_the_card_and_stays_within_version_15(machine):
    address = APP + label.ROUTE + label.fragment(machine)
    drawn = json.loads(qr_label.svg_json(json.dumps({"text": address})))
    assert drawn["ok"] and drawn["svg"].startswith("<svg") and "<script" not in drawn["svg"]
    text, version = _read_back(address)
    assert text == address and version == drawn["version"] <= VERSION_MAX
    assert label.read(text.split(label.ROUTE, 1)[1])["card"]["name"] == machine["card"]["name"]


@pytest.mark.parametrize("request_text", ["{}", '{"text": ""}', '{"text": 5}', "not json",
                                          json.dumps({"text": "x" * 5000})])
def test_a_bad_request_is_words_not_a_traceback(request_text):
    answer = json.loads(qr_label.svg_json(request_text))
    assert answer["ok"] is False and answer["errors"][0]["message"].startswith("no QR code drawn")
