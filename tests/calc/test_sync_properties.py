"""Property tests of the merge (hypothesis, tests only): phones that edit, delete, add,
settle and swap files in any order end the same once every file has gone round, and
merging is commutative and idempotent. The rules are the project's own
(calc/machines/sync.py); the machines and readings are invented."""

import json

import pytest

hypothesis = pytest.importorskip("hypothesis")
from hypothesis import given, settings, strategies as st  # noqa: E402

from calc.machines import checkmarks, records, revisions, sync  # noqa: E402

START = "2026-04-01T07:00:00+02:00"
CARD = records.new_machine({"name": "Press 1"}, "metric", START, "press-1")
TEMPLATE = records.new_reading("viscosity-at-temperature", {"temp": "50"}, "metric", CARD,
                               START, examples=True)["record"]
RESULTS = checkmarks.new_results("checklist-water", "press-1", "2026-04-01",
                                 {"condensation/look-inside": "pass"}, {}, "", START)


def _stamp(step: int) -> str:
    return f"2026-04-{2 + step // 24:02d}T{step % 24:02d}:30:00+02:00"


def _new_reading(key: str, step: int) -> dict:
    return revisions.first_rev({**TEMPLATE, "id": key, "time": _stamp(step),
                                "updated": _stamp(step)})


def _start() -> dict:
    docs = [CARD, _new_reading("r-a", 0), _new_reading("r-b", 0), RESULTS]
    return {d["id"]: d for d in docs}


def _edited(doc: dict, step: int) -> dict:
    kind = sync.kind_of(doc)
    if kind == "machines":
        return revisions.revised({**doc, "card": {"name": f"Press 1 ({step})"}}, _stamp(step))
    if kind == "readings":
        return revisions.revised({**doc, "note": f"note {step}"}, _stamp(step))
    return checkmarks.saved(doc, {"condensation/look-inside": ("pass", "fail")[step % 2],
                                  "condensation/check-breather": "pass"}, {}, f"{step}",
                            _stamp(step))


def _send(source: dict, target: dict) -> dict:
    """`target` imports the file `source` exports, through JSON text."""
    made = sync.export_file(
        {kind: [d for d in source.values() if sync.kind_of(d) == kind] for kind in sync.KINDS},
        _stamp(0))["file"]
    found = sync.checked_export(json.loads(json.dumps(made)))
    merged = sync.merge(list(target.values()), [d for k in sync.KINDS for d in found[k]])
    for docs in merged["put"].values():
        for doc in docs:
            target[doc["id"]] = doc
    return merged


def _play(phones: list[dict], steps: list[tuple]) -> None:
    for step, (action, who, other, pick) in enumerate(steps, 1):
        phone = phones[who % len(phones)]
        keys = sorted(phone)
        doc = phone[keys[pick % len(keys)]]
        if action == "edit" and not doc.get("deleted"):
            phone[doc["id"]] = _edited(doc, step)
        elif action == "edit" and sync.kind_of(doc) == "checks":
            phone[doc["id"]] = _edited(doc, step)  # ticked again after a deletion
        elif action == "delete":
            phone[doc["id"]] = revisions.deleted(doc, _stamp(step))
        elif action == "add":
            new = _new_reading(f"r-{step}", step)
            phone[new["id"]] = new
        elif action == "settle" and doc.get("conflicts"):
            sides = revisions.leaves(doc)
            phone[doc["id"]] = revisions.settle(doc, sides[pick % len(sides)]["rev"],
                                                _stamp(step))
        elif action == "send":
            _send(phone, phones[other % len(phones)])


STEPS = st.lists(st.tuples(st.sampled_from(("edit", "delete", "add", "settle", "send",
                                            "send")),
                           st.integers(0, 4), st.integers(0, 4), st.integers(0, 20)),
                 max_size=16)


def _converge(phones: list[dict]) -> None:
    # Round the ring twice: after that every phone has seen every other's file.
    for _ in range(2):
        for i, phone in enumerate(phones):
            _send(phone, phones[(i + 1) % len(phones)])


def _check(phones: list[dict], steps: list[tuple]) -> None:
    _play(phones, steps)
    # Commutative: A into B and B into A give the same.
    one, two = dict(phones[0]), dict(phones[1])
    _send(dict(phones[1]), one)
    _send(dict(phones[0]), two)
    assert one == two
    _converge(phones)
    assert all(phone == phones[0] for phone in phones)
    # Idempotent: merging again changes nothing, whichever way.
    for i, phone in enumerate(phones):
        again = _send(phone, phones[i - 1])
        assert again["message"] == "nothing new" and not any(again["put"].values())
    # Nothing made apart is lost: every conflict's sides are there to settle.
    for doc in phones[0].values():
        sides = revisions.leaves(doc)
        assert len({s["rev"] for s in sides}) == len(sides)


@settings(max_examples=60)
@given(STEPS)
def test_three_phones_converge_whatever_they_do(steps):
    _check([_start(), _start(), _start()], steps)


@pytest.mark.slow
@settings(max_examples=400)
@given(st.lists(STEPS.filter(bool), min_size=1, max_size=3).map(lambda runs: sum(runs, [])))
def test_five_phones_converge_over_long_runs(steps):
    _check([_start() for _ in range(5)], steps)
