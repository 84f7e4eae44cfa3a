"""A machine's card in a label's fragment (calc.machines.label): it comes back whole, and
anything that is not a label of this app is refused with a reason, changing nothing."""

import base64
import json
import zlib
from datetime import date

import pytest

from calc import bridge
from calc.kernel.errors import InputError
from calc.machines import card as cards
from calc.machines import demo, label, records

PLANT = demo.plant(date(2026, 3, 4))  # invented machines


def _packed(obj) -> str:
    packer = zlib.compressobj(9, zlib.DEFLATED, -15)
    raw = json.dumps(obj).encode() if not isinstance(obj, bytes) else obj
    return "1." + base64.urlsafe_b64encode(packer.compress(raw) + packer.flush()).decode().rstrip("=")


@pytest.mark.parametrize("machine", PLANT["machines"], ids=lambda m: m["card"]["name"])
def test_every_card_comes_back_from_its_label(machine):
    back = label.read(label.fragment(machine))
    kept = {k: v for k, v in machine["card"].items() if k not in label.LEFT_OFF}
    assert back["card"] == kept
    assert (back["id"], back["rev"], back["updated"]) == (machine["id"], machine["rev"], machine["updated"])


def test_every_card_field_has_its_place_in_version_1():
    # A field added to the card later needs a new label version: this says so the day it happens.
    assert set(cards.FIELDS) == set(label.LABEL_KEYS) | set(label.LEFT_OFF)
    assert len(label.LABEL_KEYS) == len(set(label.LABEL_KEYS))


def test_the_label_says_the_name_oil_grade_and_cleanliness_target_in_words():
    mill = next(m for m in PLANT["machines"] if m["card"]["name"].startswith("Mill 2"))
    said = {line["label"]: line["text"] for line in label.words(mill, "us")}
    assert said["Name"] == "Mill 2 (demo)" and said["ISO VG grade"] == "VG 32"
    assert said["Oil (trade name)"] == "Invented HM 32"
    assert said["Cleanliness target, ISO 4406"] == "16/14/11"


@pytest.mark.parametrize("text, why", [
    ("2.AAAA", "version '2'"),
    ("1.!!!!", "does not decode"),
    ("1." + "A" * 3000, "far too long"),
    (None, "missing"),
    (_packed({"not": "a list"}), "not a card"),
    (_packed(["m", "1-00", "2026-03-04T09:15:00+01:00", "not a list"]), "not a card"),
    (_packed(b"\0" * 1_000_000), "cut short or far too large"),  # a zip bomb: 1 MB of zeros in 1 kB
    (_packed(b"[" * 5000 + b"]" * 5000), "not a card"),
])
def test_what_is_not_a_label_is_refused_with_a_reason(text, why):
    with pytest.raises(InputError) as refused:
        label.read(text)
    assert refused.value.field == "label" and why in str(refused.value)


def test_a_label_with_a_bad_card_field_names_it():
    machine = PLANT["machines"][0]
    values = [machine["card"].get(k) for k in label.LABEL_KEYS]
    values[label.LABEL_KEYS.index("pump_flow")] = 1e308
    with pytest.raises(InputError) as refused:
        label.read(_packed([machine["id"], machine["rev"], machine["updated"], values]))
    assert "pump_flow" in str(refused.value)


def test_markup_in_a_label_stays_text():
    made = records.new_machine({"name": "<img src=x onerror=alert(1)>"}, "metric",
                               "2026-03-04T09:15:00+01:00", "m9")
    assert label.read(label.fragment(made))["card"]["name"] == "<img src=x onerror=alert(1)>"


def test_the_label_ops_say_whether_this_phone_has_the_card():
    machine = PLANT["machines"][1]
    made = json.loads(bridge.machines_json(json.dumps({"op": "label", "machine": machine})))
    ask = lambda local: json.loads(bridge.machines_json(json.dumps(  # noqa: E731
        {"op": "label-read", "fragment": made["fragment"], "local": local})))
    assert ask(None)["state"] == "new"
    assert ask(machine)["state"] == "same"
    edited = json.loads(bridge.machines_json(json.dumps({
        "op": "card-check", "card": {**machine["card"], "site": "Cell 4"}, "units": "metric",
        "id": machine["id"], "time": "2026-03-05T08:00:00+01:00", "previous": machine})))["machine"]
    answer = ask(edited)
    assert answer["state"] == "differs" and answer["local_updated"] == edited["updated"]
    assert answer["machine"]["card"]["site"] == machine["card"]["site"]  # the label's, not replaced
