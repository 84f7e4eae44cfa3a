"""Records that travel: documents with revisions and deletion markers, the merge of two
phones' records, the export file and the page's requests for them.

The merge rules tested here are the project's own, stated in calc/machines/sync.py; each
is tested once, then the three-phone case of issue 16 and the round trip of every kind of
record through a file. Names, machines and places are invented."""

import json

import pytest

from calc import bridge
from calc.kernel.errors import InputError
from calc.machines import api, checkmarks, records, revisions, sync

T0 = "2026-03-04T09:15:00+01:00"
T1 = "2026-03-05T08:00:00+01:00"
T2 = "2026-03-05T09:00:00+01:00"
T3 = "2026-03-06T10:00:00+01:00"


def _card(name="Shear 7", machine_id="shear-7"):
    return records.new_machine({"name": name, "grade": "VG 46"}, "metric", T0, machine_id)


def _reading(machine=None, temp="60", stamp=T0):
    return records.new_reading("viscosity-at-temperature", {"temp": temp}, "metric", machine,
                               stamp, examples=True)["record"]


def _results(marks=None, machine="shear-7", stamp=T0):
    return checkmarks.new_results("checklist-water", machine, "2026-03-04",
                                  marks or {"condensation/look-inside": "pass"}, {}, "", stamp)


def _edit(doc, stamp, **changes):
    return revisions.revised({**doc, **changes}, stamp)


def _through_page(doc):
    """As the page hands a document back: JSON text, whole floats written as ints."""
    return json.loads(json.dumps(doc).replace(".0,", ",").replace(".0}", "}"))


def _only(merged, kind):
    assert len(merged["put"][kind]) == 1, merged
    return merged["put"][kind][0]


# --- Documents ------------------------------------------------------------------------------

def test_new_records_are_revision_one_of_their_content():
    machine, reading = _card(), _reading(_card())
    for doc in (machine, reading, _results()):
        assert revisions.REV.fullmatch(doc["rev"]) and doc["rev"].startswith("1-")
        assert doc["history"] == [] and records.when(doc["updated"]) is not None
    assert reading["updated"] == reading["time"] == T0
    # The same content gives the same rev; a different one another.
    assert _card()["rev"] == machine["rev"] and _card("Shear 8")["rev"] != machine["rev"]


def test_a_record_of_an_earlier_build_gets_the_same_rev_on_every_phone():
    old = {k: v for k, v in _reading(_card()).items() if k not in ("rev", "history", "updated")}
    upgraded = revisions.with_rev(old)
    assert upgraded["updated"] == old["time"] and upgraded["rev"].startswith("1-")
    # Another phone holds the same record after a trip through the page's JSON.
    assert revisions.with_rev(_through_page(old))["rev"] == upgraded["rev"]
    assert sync.upgraded(_through_page(old), "readings")["rev"] == upgraded["rev"]
    assert revisions.with_rev(upgraded) is upgraded


def test_an_edit_is_the_next_revision_and_remembers_the_last():
    card = _card()
    edited = _edit(card, T1, card={"name": "Shear 7 (bay 2)"})
    again = _edit(edited, T2, card={"name": "Shear 7 (bay 3)"})
    assert edited["rev"].startswith("2-") and edited["history"] == [card["rev"]]
    assert again["rev"].startswith("3-") and again["history"] == [edited["rev"], card["rev"]]
    assert again["updated"] == T2
    many = card
    for n in range(revisions.HISTORY_MAX + 5):
        many = _edit(many, T1, card={"name": f"Shear {n}"})
    assert len(many["history"]) == revisions.HISTORY_MAX and many["history"][0].startswith("55-")
    with pytest.raises(InputError) as err:
        _edit(card, "2026-03-05 08:00")
    assert err.value.field == "time"


def test_a_deletion_marker_keeps_only_what_says_what_it_was():
    machine = _card()
    reading, results = _reading(machine), _results()
    assert set(revisions.deleted(machine, T1)) == {"id", "format", "version", "rev", "history",
                                                   "updated", "deleted"}
    gone = revisions.deleted(reading, T1)
    assert gone["machine"] == machine["id"] and "inputs" not in gone and "note" not in gone
    assert gone["rev"].startswith("2-") and gone["history"] == [reading["rev"]]
    marker = revisions.deleted(results, T1)
    assert (marker["checklist"], marker["machine"], marker["day"]) == (
        "checklist-water", "shear-7", "2026-03-04") and "marks" not in marker
    assert revisions.deleted(gone, T2) is gone
    with pytest.raises(InputError):
        revisions.revised(gone, T2)


def test_a_reading_from_outside_has_its_revision_members_checked():
    good = _reading()
    assert records.checked_reading(good) == good
    tombstone = revisions.deleted(good, T1)
    assert records.checked_reading(tombstone) == tombstone
    hostile = [dict(good, rev="2-xyz"), dict(good, rev=2), dict(good, history="1-abc"),
               dict(good, history=[good["rev"]]),  # an ancestor with the same N
               dict(good, history=["0-" + "a" * 16]),
               dict(good, history=[f"1-{n:016x}" for n in range(51)], rev="60-" + "a" * 16),
               dict(good, updated="yesterday"), dict(good, deleted="yes"),
               {k: v for k, v in good.items() if k != "rev"} | {"deleted": True},
               {k: v for k, v in good.items() if k != "updated"}]
    found = records.checked_readings(hostile)
    assert found["refused"] == len(hostile) and found["readings"] == []


def test_a_card_from_outside_is_parsed_again():
    card = _card()
    assert records.checked_machine(card) == card
    assert records.checked_machine(dict(card, demo=True, colour="red"))["demo"] is True
    for bad, field in ((dict(card, card={"name": "X", "pump_flow": -4}), "pump_flow"),
                       (dict(card, card={"name": "<script>" * 20}), "name"),
                       (dict(card, card=[1]), "card"), (dict(card, updated=None), "updated"),
                       (dict(card, format="sumpside-reading"), "format")):
        with pytest.raises(InputError) as err:
            records.checked_machine(bad)
        assert err.value.field == field


def test_checklist_results_are_a_document_per_checklist_machine_and_day():
    made = _results({"condensation/look-inside": "fail", "condensation/check-breather": "pass"})
    assert made["id"] == "checklist-water.shear-7.2026-03-04"
    assert checkmarks.checked_results(made) == made
    assert checkmarks.saved(made, made["marks"], {}, "", T1) is made  # nothing changed
    ticked = checkmarks.saved(made, {"condensation/look-inside": "pass"}, {}, "", T1)
    assert ticked["history"] == [made["rev"]] and ticked["updated"] == T1
    again = checkmarks.saved(revisions.deleted(ticked, T2), {}, {}, "", T3)
    assert again["rev"].startswith("4-") and "deleted" not in again
    for bad, field in ((dict(made, id="checklist-water.other.2026-03-04"), "id"),
                       (dict(made, marks={"condensation/look-inside": "maybe"}), "marks"),
                       (dict(made, marks={"<b>": "pass"}), "marks"),
                       (dict(made, notes={"a/b": "x" * 501}), "notes"),
                       (dict(made, checklist="viscosity-index"), "checklist"),
                       (dict(made, day="2026-02-30"), "day")):
        with pytest.raises(InputError) as err:
            checkmarks.checked_results(bad)
        assert err.value.field == field


# --- The merge rules, each once -------------------------------------------------------------

def test_a_document_on_one_side_only_is_kept():
    reading = _reading()
    merged = sync.merge([], [reading])
    assert merged["put"]["readings"] == [reading] and merged["added"]["readings"] == 1
    assert merged["message"] == "1 reading added"
    kept = sync.merge([reading], [])
    assert kept["put"]["readings"] == [] and kept["message"] == "nothing new"


def test_the_same_revision_changes_nothing():
    card = _card()
    merged = sync.merge([card], [dict(card)])
    assert merged["put"]["machines"] == [] and merged["unchanged"] == 1
    assert merged["message"] == "nothing new"


def test_the_revision_that_descends_from_the_other_wins():
    card = _card()
    edited = _edit(card, T1, card={"name": "Shear 7 (bay 2)"})
    forward = sync.merge([card], [edited])
    assert _only(forward, "machines") == edited and forward["message"] == "1 card updated"
    assert sync.merge([edited], [card])["put"]["machines"] == []  # the older one is not taken


def test_a_deleted_reading_beats_the_untouched_copy():
    reading = _reading()
    gone = revisions.deleted(reading, T1)
    merged = sync.merge([reading], [gone])
    assert _only(merged, "readings") == gone and merged["message"] == "1 reading deleted"
    assert sync.merge([gone], [reading])["put"]["readings"] == []


def test_an_edit_made_apart_from_a_deletion_is_not_lost():
    card = _card()
    edited = _edit(card, T1, card={"name": "Shear 7 (rebuilt)"})
    gone = revisions.deleted(card, T2)
    merged = _only(sync.merge([gone], [edited]), "machines")
    assert merged["card"]["name"] == "Shear 7 (rebuilt)" and merged["rev"] == edited["rev"]
    assert merged["conflicts"] == [gone]  # the deletion is kept beside it, to confirm
    assert sync.merge([edited], [gone])["put"]["machines"] == [merged]
    # A reading's note edited on one phone keeps the reading another phone deleted.
    reading = _reading()
    noted = _edit(reading, T1, note="sampled after the top-up")
    assert _only(sync.merge([revisions.deleted(reading, T2)], [noted]), "readings")["note"] == \
        "sampled after the top-up"


def test_two_card_edits_made_apart_keep_both_the_higher_revision_shown():
    card = _card()
    mine = _edit(card, T3, card={"name": "Shear 7 (north)"})
    theirs = _edit(_edit(card, T1, card={"name": "Shear 7, bay 2"}), T2,
                   card={"name": "Shear 7, bay 3"})
    merged = sync.merge([mine], [theirs])
    shown = _only(merged, "machines")
    # N 3 beats N 2, whatever the times: a card's winner is by revision.
    assert shown["card"]["name"] == "Shear 7, bay 3" and shown["conflicts"] == [mine]
    assert merged["message"] == "1 card updated, 1 conflict to settle"
    assert sync.merge([theirs], [mine])["put"]["machines"] == [shown]
    # Same N: the higher hash, the same on both phones.
    a, b = (_edit(card, T1, card={"name": n}) for n in ("Shear 7 (a)", "Shear 7 (b)"))
    first, second = sorted((a, b), key=lambda d: revisions.rev_order(d["rev"]), reverse=True)
    for sides in ([a, b], [b, a]):
        held = sync.resolve(sides, "machines")
        assert held["rev"] == first["rev"] and held["conflicts"] == [second]


def test_two_note_edits_made_apart_show_the_later_one():
    reading = _reading()
    # Two edits on one phone (N 3), one later edit on the other (N 2): the later one shows.
    early = _edit(_edit(reading, T1, note="x"), T2, note="oil looked hazy")
    late = _edit(reading, T3, note="oil clear after an hour")
    for sides in ([early, late], [late, early]):
        merged = sync.resolve(sides, "readings")
        assert merged["note"] == "oil clear after an hour" and merged["conflicts"] == [early]


def test_a_settled_conflict_descends_from_both_sides_and_wins_everywhere():
    card = _card()
    a, b = (_edit(card, T1, card={"name": n}) for n in ("Shear 7 (a)", "Shear 7 (b)"))
    held = sync.resolve([a, b], "machines")
    chosen = held["conflicts"][0]["rev"]
    settled = revisions.settle(held, chosen, T2)
    assert {a["rev"], b["rev"]} <= set(settled["history"]) and "conflicts" not in settled
    assert settled["card"] == held["conflicts"][0]["card"] and settled["updated"] == T2
    assert sync.resolve([a, b, settled], "machines") == settled
    for phone in ([a], [b], [held]):
        assert _only(sync.merge(phone, [settled]), "machines") == settled
    with pytest.raises(InputError) as err:
        revisions.settle(held, "9-" + "0" * 16, T2)
    assert err.value.field == "rev"
    with pytest.raises(InputError):
        revisions.settle(settled, settled["rev"], T3)  # nothing left to settle
    deleting = revisions.deleted(held, T2)  # a deletion settles a conflict too
    assert sync.resolve([a, b, deleting], "machines") == deleting


def test_the_message_says_what_happened_in_plain_words():
    # The example of issue 16, word for word.
    assert sync.said({"added": {"readings": 12}, "updated": {"machines": 1}}, 1) == \
        "12 readings added, 1 card updated, 1 conflict to settle"
    assert sync.said({"deleted": {"checks": 1, "readings": 2}, "refused": {"machines": 3}}, 2) \
        == "2 readings deleted, 1 checklist result deleted, 3 cards refused, 2 conflicts to settle"
    assert sync.said({"added": {"readings": 0}}, 0) == "nothing new"


# --- Three phones ---------------------------------------------------------------------------

def _apply(phone: dict, merged: dict) -> None:
    for docs in merged["put"].values():
        for doc in docs:
            phone[doc["id"]] = doc


def _send(source: dict, target: dict) -> dict:
    """`target` imports the file `source` exports (through JSON text, as between phones)."""
    made = sync.export_file(_by_kind(source), T3)["file"]
    found = sync.checked_export(json.loads(json.dumps(made)))
    incoming = [doc for kind in sync.KINDS for doc in found[kind]]
    merged = sync.merge(list(target.values()), incoming)
    _apply(target, merged)
    return merged


def _by_kind(phone: dict) -> dict:
    return {kind: [d for d in phone.values() if sync.kind_of(d) == kind] for kind in sync.KINDS}


def test_three_phones_that_swap_files_in_any_order_end_the_same():
    card = _card()
    readings = [_reading(card, temp) for temp in ("40", "50", "60")]
    start = {d["id"]: d for d in [card, *readings]}
    a, b, c = dict(start), dict(start), dict(start)
    a[card["id"]] = _edit(card, T1, card={"name": "Shear 7 (north bay)"})
    b[card["id"]] = _edit(card, T2, card={"name": "Shear 7 (new pump)"})
    c[readings[0]["id"]] = revisions.deleted(readings[0], T1)
    for temp in ("70", "80"):
        new = _reading(card, temp, T2)
        c[new["id"]] = new
    said = [_send(a, b)["message"], _send(b, c)["message"], _send(c, a)["message"],
            _send(a, b)["message"]]
    # Each says what was new to the phone that imported.
    assert said[0].endswith("1 conflict to settle") and said[1] == \
        "1 card updated, 1 conflict to settle"
    assert said[2].startswith("2 readings added") and "1 reading deleted" in said[2]
    assert said[3].startswith("2 readings added, 1 reading deleted")
    assert a == b == c
    shown = a[card["id"]]
    assert len(shown["conflicts"]) == 1 and sync.to_settle(shown)
    assert sum(sync.to_settle(d) for d in a.values()) == 1  # the conflict, once
    assert sorted(r.get("deleted", False) for r in a.values() if r["format"] == records.READING) \
        == [False] * 4 + [True]
    # C settles it; the settlement reaches the others through B, in the other direction.
    c[card["id"]] = revisions.settle(c[card["id"]], shown["conflicts"][0]["rev"], T3)
    assert _send(c, b)["message"] == "1 card updated" and _send(b, a)["message"] == \
        "1 card updated"
    assert a == b == c and not any(sync.to_settle(d) for d in a.values())
    for source, target in ((a, b), (b, c), (c, a)):  # and again: nothing changes
        assert _send(source, target)["message"] == "nothing new"


# --- The export file ------------------------------------------------------------------------

def _everything():
    card = _card()
    reading, other = _reading(card), _reading(card, "45")
    noted = _edit(other, T1, note="taken at the return line")
    migrated = records.migrate([{"at": "2025-11-02T10:00:00Z", "machine": "Old press",
                                 "tool": "no-longer-a-tool", "inputs": {"x": "1"},
                                 "text": {"x": "1"}, "level": "ok"}], T0)["readings"][0]
    held = sync.resolve([_edit(card, T1, card={"name": "Shear 7 (a)"}),
                         _edit(card, T1, card={"name": "Shear 7 (b)"})], "machines")
    return {"machines": [held, revisions.deleted(_card("Old saw", "old-saw"), T2)],
            "readings": [reading, noted, migrated, revisions.deleted(_reading(card, "70"), T2)],
            "checks": [_results(), revisions.deleted(_results(machine=None), T1)]}


def test_every_kind_of_record_comes_back_from_a_file_as_it_went():
    stored = _everything()
    made = sync.export_file(stored, T3)
    assert made["left_out"] == 0 and made["file"]["exported"] == T3
    text = json.dumps(made["file"], allow_nan=False)
    found = sync.checked_export(json.loads(text))
    assert found["refused"] == {"machines": 0, "readings": 0, "checks": 0}
    assert found["version"] == 2 and not found["migrated"] and found["exported"] == T3
    for kind in sync.KINDS:
        assert found[kind] == stored[kind], kind
    # Importing it on a phone that holds all of it changes nothing.
    assert sync.merge([d for k in sync.KINDS for d in stored[k]],
                      [d for k in sync.KINDS for d in found[k]])["message"] == "nothing new"


def test_a_file_of_the_previous_version_is_read_with_revs():
    card = {k: v for k, v in _card().items() if k not in ("rev", "history")}
    reading = {k: v for k, v in _reading(card).items() if k not in ("rev", "history", "updated")}
    old = {"format": "sumpside-export", "version": 1, "exported": T1, "machines": [card],
           "readings": [reading]}
    found = sync.checked_export(_through_page(old))
    assert found["migrated"] and found["version"] == 1 and found["checks"] == []
    assert found["machines"][0]["rev"] == revisions.with_rev(card)["rev"]
    assert found["readings"][0]["rev"] == revisions.with_rev(reading)["rev"]
    # The phone that exported it, still holding the records without revs, takes nothing new
    # and stores them back with their revs.
    merged = sync.merge([card, reading], found["machines"] + found["readings"])
    assert merged["message"] == "nothing new" and len(merged["put"]["readings"]) == 1


def test_a_log_of_an_earlier_build_is_migrated():
    entries = [{"at": "2025-10-01T08:00:00Z", "machine": "Line 4 saw", "tool":
                "viscosity-at-temperature", "units": "metric", "inputs": {"temp": "55"}}]
    found = sync.checked_export(entries, T0)
    assert found["migrated"] and len(found["machines"]) == 1 and len(found["readings"]) == 1
    assert found["readings"][0]["rev"].startswith("1-")
    with pytest.raises(InputError) as err:
        sync.checked_export(entries)  # migrating makes records: it needs the time
    assert err.value.field == "time"


def _nested(depth):
    value = "x"
    for _ in range(depth):
        value = [value]
    return value


FILE = {"format": "sumpside-export", "version": 2, "exported": T0, "machines": [],
        "readings": [], "checks": []}


@pytest.mark.parametrize("hostile, field", [
    ("just text", "file"), (None, "file"), (42, "file"),
    ({**FILE, "format": "another-app"}, "format"),
    ({**FILE, "version": 3}, "version"), ({**FILE, "version": "2"}, "version"),
    ({**FILE, "version": True}, "version"),
    ({k: v for k, v in FILE.items() if k != "readings"}, "readings"),  # cut short
    ({**FILE, "checks": {"a": 1}}, "checks"),
    ({**FILE, "readings": [{"note": _nested(5000)}]}, "file"),
    ({**FILE, "readings": [0] * (sync.DOCS_MAX + 1)}, "readings"),
    (_nested(100), "file"),
])
def test_a_file_that_is_not_a_whole_export_is_refused_whole(hostile, field):
    with pytest.raises(InputError) as err:
        sync.checked_export(hostile, T0)
    assert err.value.field == field
    answer = api.call({"op": "merge", "local": {}, "incoming": hostile, "time": T0})
    assert answer["ok"] is False and "put" not in answer


def test_hostile_records_in_a_file_are_refused_and_the_rest_taken():
    good = _reading()
    script = "<img src=x onerror=alert(1)>"
    hostile = [dict(good, id=script * 20), dict(good, note=script * 400),
               dict(good, inputs={"temp": 1e400}), dict(good, tracked={"oil_temp": "hot"}),
               dict(good, machine={"id": 1}), "junk", None, [good],
               dict(good, rev="1-" + "g" * 16)]
    card = _card()
    file = {**FILE, "readings": [good, *hostile],
            "machines": [card, dict(card, id="x", card={"name": script, "pump_flow": "1e308"}),
                         dict(card, id="y", conflicts=[dict(card, id="z")])],
            "checks": [dict(_results(), marks={"a/b": script})]}
    found = sync.checked_export(json.loads(json.dumps(file)))
    assert found["readings"] == [good] and found["machines"] == [card]
    assert found["refused"] == {"machines": 2, "readings": len(hostile), "checks": 1}
    assert len(found["reasons"]) == sync.REASONS_MAX and found["reasons"][0].startswith(
        "card 2: ")
    answer = api.call({"op": "merge", "local": {}, "incoming": file, "time": T0})
    assert answer["message"] == ("1 card added, 1 reading added, 2 cards refused, "
                                 "9 readings refused, 1 checklist result refused")


# --- The page's requests --------------------------------------------------------------------

def _ask(request):
    """A request through the worker's door: JSON text in, JSON text out."""
    return json.loads(bridge.machines_json(json.dumps(request)))


def test_merge_export_and_export_check_through_the_bridge():
    stored = _everything()
    made = _ask({"op": "export", **stored, "time": T3})
    assert made["ok"] and made["file"]["version"] == 2
    checked = _ask({"op": "export-check", "file": made["file"]})
    assert checked["ok"] and checked["machines"] == stored["machines"]
    fresh = _ask({"op": "merge", "local": {"machines": [], "readings": []},
                  "incoming": made["file"], "time": T3})
    assert fresh["ok"] and fresh["message"] == ("1 card added, 3 readings added, 1 checklist "
                                                "result added, 1 conflict to settle")
    assert fresh["open_conflicts"] == 1 and fresh["unchanged"] == 0
    assert {k: len(v) for k, v in fresh["put"].items()} == {"machines": 2, "readings": 4,
                                                             "checks": 2}
    # The machines whose digests the page makes again: those of the cards and readings put.
    assert fresh["redigest"] == sorted({"shear-7", "old-saw", stored["readings"][2]["machine"]})
    again = _ask({"op": "merge", "local": fresh["put"], "incoming": made["file"], "time": T3})
    assert again["message"] == "nothing new" and again["open_conflicts"] == 1
    refused = _ask({"op": "merge", "local": {"readings": "all"}, "incoming": made["file"]})
    assert refused["errors"][0]["field"] == "local.readings"


def test_revise_delete_and_settle_through_the_bridge():
    reading, card = _reading(), _card()
    noted = _ask({"op": "revise", "doc": reading, "changes": {"note": " drained 2 L "},
                  "time": T1})
    assert noted["changed"] and noted["doc"]["note"] == "drained 2 L"
    assert noted["doc"]["history"] == [reading["rev"]]
    same = _ask({"op": "revise", "doc": noted["doc"], "changes": {"note": "drained 2 L"},
                 "time": T2})
    assert same == {"ok": True, "doc": noted["doc"], "changed": False}
    us = _ask({"op": "revise", "doc": card, "changes": {"card": {"name": "Shear 7",
                                                                 "pump_flow": "26.4"}},
               "units": "us", "time": T1})
    assert us["doc"]["card"]["pump_flow"] == pytest.approx(99.93, abs=0.01)  # 26.4 US gal/min
    for bad in ({"changes": {"tool": "x"}}, {"changes": {"note": "x" * 2001}},
                {"doc": {"id": "x"}}):
        answer = _ask({"op": "revise", "doc": reading, "time": T1, **bad})
        assert answer["ok"] is False
    gone = _ask({"op": "delete", "docs": [card, reading], "time": T2})["docs"]
    assert [d["deleted"] for d in gone] == [True, True] and gone[1]["machine"] is None
    assert _ask({"op": "revise", "doc": gone[1], "changes": {"note": "x"}, "time": T3})[
        "errors"][0]["field"] == "doc"
    held = sync.resolve([_edit(card, T1, card={"name": "A"}), _edit(card, T1, card={"name": "B"})],
                        "machines")
    settled = _ask({"op": "settle", "doc": held, "rev": held["conflicts"][0]["rev"], "time": T2})
    assert settled["doc"]["card"] == held["conflicts"][0]["card"]
    assert _ask({"op": "settle", "doc": held, "rev": "nope", "time": T2})["ok"] is False


def test_checks_save_through_the_bridge():
    request = {"op": "checks-save", "checklist": "checklist-water", "machine": "shear-7",
               "day": "2026-03-04", "marks": {"condensation/look-inside": "fail"},
               "notes": {"condensation/look-inside": "rust under the lid"}, "note": "",
               "time": T0, "previous": None}
    made = _ask(request)["doc"]
    assert made["id"] == "checklist-water.shear-7.2026-03-04" and made["rev"].startswith("1-")
    assert _ask({**request, "previous": made, "time": T1}) == {"ok": True, "doc": made,
                                                                "changed": False}
    ticked = _ask({**request, "marks": {}, "previous": made, "time": T1})["doc"]
    assert ticked["history"] == [made["rev"]] and ticked["marks"] == {}
    other_day = dict(made, id="checklist-water.shear-7.2026-03-05", day="2026-03-05")
    assert _ask({**request, "previous": other_day})["errors"][0]["field"] == "previous"
    assert _ask({**request, "day": "03/04/2026"})["errors"][0]["field"] == "day"


def test_a_card_edited_in_its_form_or_from_a_tool_is_its_next_revision():
    card = _card()
    edited = api.call({"op": "card-check", "card": {"name": "Shear 7", "grade": "VG 68"},
                       "previous": card, "time": T1})["machine"]
    assert edited["id"] == card["id"] and edited["history"] == [card["rev"]]
    unchanged = api.call({"op": "card-check", "card": {"name": "Shear 7", "grade": "VG 46"},
                          "previous": card, "time": T1})["machine"]
    assert unchanged == card
    filled = api.call({"op": "to-card", "tool": "line-velocity", "key": "line_flow",
                       "value": "50", "machine": edited, "time": T2})
    assert filled["ok"] and filled["machine"]["history"][0] == edited["rev"]


def test_deletion_markers_are_not_shown_as_records():
    card = _card()
    readings = [_reading(card), revisions.deleted(_reading(card, "70"), T1)]
    page = api.call({"op": "machine-page", "machine": card, "readings": readings,
                     "today": "2026-03-06"})
    assert page["ok"] and page["count"] == 1
    listed = api.call({"op": "machines", "machines": [card, revisions.deleted(_card("Gone", "g"),
                                                                              T1)],
                       "readings": readings, "today": "2026-03-06"})
    assert [m["id"] for m in listed["machines"]] == [card["id"]]
    assert api.call({"op": "reading", "record": readings[1]})["ok"] is False


def test_what_this_phone_holds_at_the_same_revision_is_not_read_again():
    # The same id and revision is the same document (its rev hashes its content): a file's
    # copy is left out unread, counted unchanged, and a copy whose content was tampered with
    # behind an unchanged rev cannot replace what this phone holds.
    card, reading = _card(), _reading()
    tampered = {**reading, "note": "<script>x</script>", "tracked": {"oil_temp": "hot"}}
    file = {"format": sync.EXPORT, "version": sync.EXPORT_VERSION, "exported": T1,
            "machines": [card], "readings": [tampered], "checks": []}
    answer = api.call({"op": "merge", "local": {"machines": [card], "readings": [reading]},
                       "incoming": file, "time": T1})
    assert answer["ok"] and answer["message"] == "nothing new"
    assert answer["unchanged"] == 2 and answer["put"]["readings"] == []
    assert sum(answer["refused"].values()) == 0
    # A phone without it reads the same file in full, and refuses the tampered reading.
    fresh = api.call({"op": "merge", "local": {}, "incoming": file, "time": T1})
    assert fresh["refused"]["readings"] == 1 and fresh["put"]["machines"] == [card]


def test_a_copy_at_the_same_revision_that_keeps_a_conflict_is_read():
    # The rev hashes the content, not the sides kept in conflict beside it: a phone that
    # holds the winning card without the conflict must still learn of the conflict.
    card = _card()
    mine, theirs = _edit(card, T1, card={**card["card"], "site": "Bay 3"}), _edit(
        card, T2, card={**card["card"], "site": "Bay 4"})
    met = _only(sync.merge([mine], [theirs]), "machines")
    holder = mine if met["rev"] == mine["rev"] else theirs  # the phone whose edit is shown
    file = {"format": sync.EXPORT, "version": sync.EXPORT_VERSION, "exported": T3,
            "machines": [met], "readings": [], "checks": []}
    answer = api.call({"op": "merge", "local": {"machines": [holder]}, "incoming": file, "time": T3})
    assert answer["open_conflicts"] == 1, answer
    assert len(_only(answer, "machines")["conflicts"]) == 1


def test_a_document_the_page_marks_held_here_is_left_out_unread():
    # The page sends, in place of a document it holds the same, only its id and rev marked
    # held_here (js/kit.js narrowed): skipped like a held one, its place kept for the reasons.
    # The mark can only make a document be skipped: never stored, never refused.
    reading, other = _reading(), _reading(temp="70")
    file = {**FILE, "readings": [{"id": reading["id"], "rev": reading["rev"],
                                  sync.HELD_HERE: True}, dict(other, tracked="x"), other],
            "machines": [{sync.HELD_HERE: True, "card": "<script>x</script>"}]}
    answer = api.call({"op": "merge", "local": {}, "incoming": file, "time": T1})
    assert answer["unchanged"] == 2 and answer["refused"]["machines"] == 0
    assert [d["id"] for d in answer["put"]["readings"]] == [other["id"]]
    assert answer["reasons"][0].startswith("reading 2: ")  # the place in the whole file
