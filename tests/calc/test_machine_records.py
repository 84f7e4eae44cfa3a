"""Readings as records: what is kept (metric inputs, never display text), how a stored
reading is shown again in the reader's units, and the migration of an earlier build's log."""

import json
import random

import pytest

from calc import bridge
from calc.kernel import registry
from calc.kernel.errors import InputError
from calc.machines import records
from .cases import random_inputs

STAMP = "2026-03-04T09:15:00+01:00"


def _machine(**typed):
    return records.new_machine({"name": "Saw 2", **typed}, "metric", STAMP)


def test_a_reading_keeps_metric_inputs_and_what_it_measured():
    machine = _machine(oil_family="mineral-aw", temp_cold_start="5", tank_volume="300",
                       oil_volume="250")
    made = records.new_reading("water-in-oil", {"rh": "45", "temp": "122"}, "us", machine,
                               STAMP, note="after the washdown", examples=True)
    record = made["record"]
    # 122 degF = 50 degC (NIST SP 811, B.9); the sensor's 45 % is a % of saturation.
    assert record["inputs"]["temp"] == pytest.approx(50.0)
    assert record["inputs"]["oil_volume"] == 250.0 and record["inputs"]["temp_cold"] == 5.0
    assert set(record["from_card"]) == {"oil", "temp_cold", "oil_volume"}
    assert record["tracked"]["water_saturation"] == 45.0 and record["tracked"]["oil_temp"] == 50.0
    assert record["machine"] == machine["id"] and record["time"] == STAMP
    assert record["calc"] and record["format"] == "sumpside-reading"
    assert "text" not in record and "verdicts" not in record  # no display text is kept
    json.dumps(record, allow_nan=False)  # storable as it is


def test_a_reading_saved_in_metric_shows_in_us_units():
    record = records.new_reading("tank-sizing", {"tank_volume": "378.5411784"}, "metric", None,
                                 STAMP, examples=True)["record"]
    metric, us = records.view(record, "metric"), records.view(record, "us")
    assert metric["text"]["tank_needed"].endswith(" L")
    assert us["text"]["tank_needed"].endswith(" US gal")
    shown = {i["key"]: i["text"] for i in us["inputs"]}
    assert shown["tank_volume"] == "100 US gal"  # 378.541 L = 100 US gal (NIST SP 811)
    assert us["title"] == registry.get("tank-sizing").title and us["time"] == STAMP


def test_the_view_is_the_answer_computed_again():
    for tool_id in ("oil-condition", "suction-check", "checklist-water"):
        record = records.new_reading(tool_id, {}, "metric", None, STAMP, examples=True)["record"]
        view = records.view(record, "us")
        fresh = bridge.run(tool_id, {}, "us", examples=True)
        # The same answer; the parse's word that a value was an example is not kept.
        fresh = {k: v for k, v in fresh.items() if k != "notices"}
        assert {k: view[k] for k in fresh} == fresh


def test_a_checklist_view_lists_only_what_was_ticked():
    record = records.new_reading("checklist-water", {"milky_oil": "yes", "ppm": "650"},
                                 "metric", None, STAMP, examples=True)["record"]
    view = records.view(record, "metric")
    flags = [i["label"] for i in view["inputs"] if i["flag"]]
    assert len(flags) == 1 and view["ranked"][0]["score"] > 0


def test_inputs_that_do_not_answer_are_not_saved():
    with pytest.raises(InputError) as err:
        records.new_reading("viscosity-index", {"kv40": "10", "kv100": "20"}, "metric", None,
                            STAMP, examples=True)
    assert err.value.field == "kv100"
    with pytest.raises(InputError) as err:
        records.new_reading("tank-sizing", {}, "metric", None, "2026-03-04T09:15:00", examples=True)
    assert err.value.field == "time"  # a time without its offset is ambiguous
    with pytest.raises(InputError) as err:
        records.new_reading("tank-sizing", {}, "metric", None, STAMP, note="x" * 2001, examples=True)
    assert err.value.field == "note"


def test_an_old_record_with_renamed_keys_is_answered_again():
    record = records.new_reading("line-velocity", {}, "metric", None, STAMP, examples=True)["record"]
    old = {**record, "inputs": {("flow" if k == "line_flow" else k): v
                                for k, v in record["inputs"].items()}}
    assert records.view(old, "metric")["text"] == records.view(record, "metric")["text"]
    # An input added since is taken at its default.
    fewer = {**record, "inputs": {k: v for k, v in record["inputs"].items() if k != "pressure"}}
    assert records.view(fewer, "metric")["ok"]


def test_a_record_that_no_longer_fits_keeps_its_followed_values():
    record = records.new_reading("oil-condition", {"ppm": "300"}, "metric", None, STAMP, examples=True)["record"]
    broken = {**record, "inputs": {**record["inputs"], "kv40_now": "thick"}}
    view = records.view(broken, "metric")
    assert not view["ok"] and view["stale"] and view["tracked"]["water_ppm"] == 300.0
    assert records.view({**record, "tool": "no-such-tool"}, "metric")["stale"]


def _old_entry(rng, tool_id, index):
    """A log entry as the earlier build's page saved it: typed inputs, display text."""
    found = registry.get(tool_id)
    units = rng.choice(["metric", "us"])
    inputs = random_inputs(found, rng) if index % 3 else {}
    answer = bridge.run(tool_id, inputs, units, examples=True)
    return {"id": index + 1, "at": f"2026-0{1 + index % 9}-{1 + index % 28:02d}T08:00:00.000Z",
            "machine": ["Press 2", "press 2", "Saw 1", ""][index % 4], "tool": tool_id,
            "title": found.title, "units": units, "inputs": inputs,
            "text": answer.get("text", {}), "values": answer.get("values", {}),
            "unitOf": answer.get("units", {}), "level": answer.get("level", "ok"),
            "verdicts": [f"{v['level']}: {v['message']}" for v in answer.get("verdicts", [])]}


def test_an_earlier_log_of_500_entries_migrates_without_loss():
    rng = random.Random(20261202)
    tools = sorted(registry.tools())
    entries = [_old_entry(rng, tools[i % len(tools)], i) for i in range(500)]
    # Entries an earlier build may have left: a key renamed since, one retired since.
    entries[0]["tool"], entries[0]["inputs"], entries[0]["units"] = (
        "tank-sizing", {"flow": "50"}, "metric")
    entries[1]["tool"], entries[1]["inputs"] = "tank-sizing", {"working_level": "70"}
    # The earlier form sent every field, those its mode did not use too (grade and VI with
    # two readings): they are left out, not a reason to keep the entry as saved.
    entries[2]["tool"], entries[2]["units"] = "viscosity-at-temperature", "metric"
    entries[2]["inputs"] = {"oil_from": "readings", "kv40": "46", "temp1": "40", "kv100": "6.8",
                            "temp2": "100", "grade": "VG 46", "vi": "100", "temp": "60"}
    moved = records.migrate(entries, STAMP)
    assert len(moved["readings"]) == 500 and moved["skipped"] == 0
    assert moved["recomputed"] + moved["kept_as_saved"] == 500
    # "Press 2" and "press 2" are one machine; an entry without a name has none.
    assert sorted(m["card"]["name"] for m in moved["machines"]) == ["Press 2", "Saw 1"]
    assert sum(r["machine"] is None for r in moved["readings"]) == 125
    first, second = moved["readings"][:2]
    assert first["inputs"]["pump_flow"] == 50.0 and "as_saved" not in first
    assert second["as_saved"]["inputs"] == {"working_level": "70"}
    assert "as_saved" not in moved["readings"][2] and moved["readings"][2]["inputs"]["temp"] == 60.0
    for entry, record in zip(entries, moved["readings"]):
        view = records.view(record, "metric")
        assert view["time"] == entry["at"].replace("Z", "+00:00")
        assert view["ok"] or view["text"] == {k: str(v) for k, v in entry["text"].items()}
    json.dumps(moved, allow_nan=False)


def test_migration_skips_only_what_has_no_time():
    moved = records.migrate([{"tool": "tank-sizing"}, "junk", None,
                             {"at": "2026-01-01T08:00:00Z", "tool": "gone-tool"}], STAMP)
    assert moved["skipped"] == 3 and moved["kept_as_saved"] == 1


def test_a_reading_from_a_file_is_checked_against_the_records_shape():
    # Reproductions of hostile imports: a count where text belongs, an object where a
    # number belongs, a time that is not one, an infinite value, junk in the list.
    good = records.new_reading("viscosity-index", {"kv40": "46", "kv100": "6.8"}, "metric", None,
                               STAMP, examples=True)["record"]
    assert records.checked_reading(good) == good
    hostile = [dict(good, id="a" * 65), dict(good, tracked={"kv40": float("inf")}),
               dict(good, time="2026-05-01"), dict(good, inputs={"kv40": {"toString": 1}}),
               "junk", dict(good, tool="no-such-tool"), dict(good, note="x" * 2001),
               dict(good, level="fine"), dict(good, from_card=["nope"])]
    found = records.checked_readings([good, *hostile, dict(good, verdicts=5, title={"x": 1})])
    assert found["refused"] == len(hostile) and len(found["reasons"]) == 3
    assert found["reasons"][0].startswith("reading 2: id:")
    # Members the record does not declare are dropped, not kept.
    assert found["readings"] == [good, good]
    json.dumps(found, allow_nan=False)
