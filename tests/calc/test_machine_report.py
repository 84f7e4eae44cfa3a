"""The visit report, the CSV of readings, the demo plant and the machine kit's requests."""

import csv
import io
import json
from datetime import date

import pytest

from calc import bridge
from calc.kernel import registry
from calc.machines import api, condition, records, report
from calc.machines import card as cards
from calc.machines.demo import plant

TODAY = "2026-12-02"


@pytest.fixture(scope="module")
def demo():
    return plant(date.fromisoformat(TODAY))


def _call(**request):
    return json.loads(bridge.machines_json(json.dumps(request)))


def test_the_demo_is_three_invented_machines_with_a_history(demo):
    names = [m["card"]["name"] for m in demo["machines"]]
    assert names == ["Press 6 (demo)", "Mill 2 (demo)", "Crane 9 (demo)"]
    assert all(m["demo"] for m in demo["machines"]) and all(r["demo"] for r in demo["readings"])
    for machine in demo["machines"]:
        page = _call(op="machine-page", machine=machine, readings=demo["readings"],
                     units="metric", today=TODAY)
        assert page["ok"] and page["count"] >= 5
        assert page["latest"] and page["trends"] and page["due"]
    json.dumps(demo, allow_nan=False)


def test_the_visit_report_holds_the_days_readings(demo):
    crane = demo["machines"][2]
    day = date.fromisoformat(TODAY).replace(day=30, month=11)
    visit = report.visit(crane, demo["readings"], "us", day, who="R. Okafor",
                         notes="Drained 2 L of water from the tank bottom.")
    titles = [r["title"] for r in visit["readings"]]
    assert titles == ["Water in oil", registry.get("checklist-water").title,
                      registry.get("checklist-aeration").title]
    water = visit["readings"][0]
    # The card's facts are counted, not repeated: they head the report.
    assert water["from_card"] >= 3
    entered = {i["label"]: i["text"] for i in water["inputs"]}
    assert entered["Lab water content"] == "650 ppm"
    assert entered["Oil temperature at the reading"] == "95.0 °F"  # 35 degC, in the reader's units
    # What it found: the headline and followed values, under their screen labels.
    tool = registry.get("water-in-oil")
    wanted = {o.label for o in tool.outputs if o.headline or o.tracks}
    assert {o["label"] for o in water["outputs"]} <= wanted and water["outputs"]
    checklist = visit["readings"][1]
    assert checklist["seen"] and checklist["causes"]
    assert visit["level"] == "act" and visit["who"] == "R. Okafor" and visit["notes"]
    assert visit["card"][0]["label"] == "Site or location"
    assert any("lock out" in c for c in visit["cautions"]) and visit["signature"]
    assert visit["days"] == []
    # Another day: none of these, and the days that have readings instead, newest first.
    empty = report.visit(crane, demo["readings"], "us", date(2026, 1, 1))
    assert empty["readings"] == []
    own = [r for r in demo["readings"] if r["machine"] == crane["id"]]
    newest = sorted({r["time"][:10] for r in own}, reverse=True)[:report.READING_DAYS]
    assert empty["days"] == newest and day.isoformat() in newest


def test_csv_has_a_row_per_reading_and_output(demo):
    text = report.csv_text(demo["machines"], demo["readings"], "metric")
    assert text.startswith("\ufeff") and text.endswith("\r\n")
    rows = list(csv.reader(io.StringIO(text.lstrip("\ufeff"))))
    assert rows[0] == list(report.CSV_HEADER)
    expected = 0
    for record in demo["readings"]:
        found, _values, result = records.answer(record)
        expected += sum(result.values.get(o.key) is not None for o in found.outputs)
    assert len(rows) - 1 == expected
    by = {h: i for i, h in enumerate(rows[0])}
    ppm = next(r for r in rows[1:] if r[by["Output"]] == "Water content, ppm" or
               (r[by["Tool"]] == "Water in oil" and r[by["Unit"]] == "ppm"))
    float(ppm[by["Value"]])  # a number in its own column, the unit beside it
    assert rows[1][by["Time"]].endswith("+01:00")  # local time with its offset
    labels = {r[by["Output"]] for r in rows[1:]}
    assert "visc_change" not in labels and "Viscosity change" in labels  # screen labels


def test_csv_cells_never_run_as_formulas():
    assert report.csv_cell("=1+1") == "'=1+1"
    assert report.csv_cell("@SUM(A1)") == "'@SUM(A1)"
    assert report.csv_cell("+44 20") == "'+44 20"
    assert report.csv_cell("-2+3") == "'-2+3"
    assert report.csv_cell("\t=1") == "'\t=1"
    assert report.csv_cell("-6.09") == "-6.09"  # a plain number stays a number
    machine = records.new_machine({"name": '=HYPERLINK("http://x","y")'}, "metric",
                                  "2026-03-04T09:15:00+01:00")
    reading = records.new_reading("tank-sizing", {}, "metric", machine,
                                  "2026-03-04T09:15:00+01:00", note="@rm", examples=True)["record"]
    rows = list(csv.reader(io.StringIO(report.csv_text([machine], [reading], "metric")
                                       .lstrip("\ufeff"))))
    assert all(not cell.startswith(("=", "+", "@")) for row in rows for cell in row)
    assert rows[1][1] == "'" + machine["card"]["name"]


def test_every_op_refuses_a_bad_request_naming_the_field():
    for op in api.OPS:
        answer = _call(op=op, units="metric")
        if op in ("card-form",):
            assert answer["ok"]
            continue
        assert answer["ok"] is False and answer["errors"][0]["field"], (op, answer)
    assert _call(op="machine-page", machine={"id": "m", "card": {"name": "A"}}, readings=[],
                 today="soon")["errors"][0]["field"] == "today"
    assert _call(op="run", tool="tank-sizing", units="imperial")["errors"][0]["field"] == "units"
    assert not _call(op="nope")["ok"]
    assert not json.loads(bridge.machines_json("[1, 2"))["ok"]
    assert not json.loads(bridge.machines_json("[1, 2]"))["ok"]


def test_save_to_card_changes_only_that_fact():
    machine = records.new_machine({"name": "Saw 2", "pump_flow": "40"}, "metric",
                                  "2026-03-04T09:15:00+01:00")
    answer = _call(op="to-card", machine=machine, tool="tank-sizing", key="pump_flow",
                   value="10", units="us", time="2026-03-05T09:00:00+01:00")
    # 10 US gal/min = 37.854 L/min (NIST SP 811, B.9).
    assert answer["machine"]["card"]["pump_flow"] == pytest.approx(37.8541, rel=1e-5)
    assert answer["machine"]["id"] == machine["id"]
    refused = _call(op="to-card", machine=machine, tool="tank-sizing", key="air_release",
                    value="5", units="metric", time="2026-03-05T09:00:00+01:00")
    assert not refused["ok"] and refused["errors"][0]["field"] == "air_release"


def test_the_form_is_filled_from_the_card_in_the_readers_units(demo):
    press = demo["machines"][0]
    filled = _call(op="fill", tool="suction-check", machine=press, units="us")
    # 63 mm = 2.48 in; 180 L/min = 47.55 US gal/min (NIST SP 811, B.9).
    assert filled["values"]["suction_bore"] == "2.48" and filled["values"]["pump_flow"] == "47.55"
    assert filled["bound"]["pump_flow"] == "pump_flow" and not filled["misfits"]


def test_the_machines_list_from_digests_is_the_list_from_all_readings(demo):
    full = _call(op="machines", machines=demo["machines"], readings=demo["readings"],
                 units="metric", today=TODAY)
    plant_now = _call(op="demo", today=TODAY)
    assert set(plant_now["digests"]) == {m["id"] for m in plant_now["machines"]}
    digests = {}
    # Digests made one save at a time are the digests of all the readings at once.
    for machine in demo["machines"]:
        mine = [r for r in demo["readings"] if r["machine"] == machine["id"]]
        facts, card = cards.facts(machine["card"])[0], machine["card"]
        known = None
        for record in mine:
            known = condition.digest_add(known, record, facts, card)
        assert known == condition.digest(mine, facts, card)
        digests[machine["id"]] = known
    small = _call(op="machines", machines=demo["machines"], digests=digests, units="metric",
                  today=TODAY)
    assert small == full
    # A card changed since its digest was made (on another phone, say): worked out again.
    edited = [{**m, "card": {**m["card"], "an_new": 0.1}} for m in demo["machines"]]
    assert all(condition.fresh_summary(digests[m["id"]], m["card"]) is None for m in edited)
    again = _call(op="machines", machines=edited, digests=digests, units="metric", today=TODAY)
    fresh = _call(op="machines", machines=edited, readings=demo["readings"], units="metric",
                  today=TODAY)
    assert again == fresh
    crane = next(m for m in full["machines"] if m["name"].startswith("Crane"))
    assert crane["level"] == "act" and crane["overdue"] == 1 and crane["due"]["key"] == "filter"
    assert [m["name"] for m in full["machines"]] == sorted(m["name"] for m in full["machines"])


def test_a_digest_sent_without_its_readings_is_asked_for_when_stale(demo):
    machine = demo["machines"][0]
    mine = [r for r in demo["readings"] if r["machine"] == machine["id"]]
    known = condition.digest(mine, cards.facts(machine["card"])[0], machine["card"])
    slim = {k: v for k, v in known.items() if k != "readings"}
    ok = _call(op="machines", machines=[machine], digests={machine["id"]: slim}, units="metric",
               today=TODAY)
    assert ok["stale"] == [] and ok["machines"][0]["level"] == known["level"] == "act"
    edited = {**machine, "card": {**machine["card"], "notes": "edited on another phone"}}
    stale = _call(op="machines", machines=[edited], digests={machine["id"]: slim},
                  units="metric", today=TODAY)
    assert stale["stale"] == [machine["id"]] and stale["machines"][0]["level"] is None


def test_a_digest_still_holds_after_a_trip_through_json(demo):
    # The page keeps records as JavaScript numbers: 2.0 comes back as 2, and the digest's
    # verdicts must still be taken as holding for that card.
    machine = demo["machines"][0]
    mine = [r for r in demo["readings"] if r["machine"] == machine["id"]]
    known = condition.digest(mine, cards.facts(machine["card"])[0], machine["card"])
    tripped = json.loads(json.dumps(machine["card"]).replace(".0,", ",").replace(".0}", "}"))
    assert tripped["elbows_90"] == 2 and isinstance(tripped["elbows_90"], int)
    assert condition.fresh_summary(known, tripped) is not None
