"""The benchmark's merge row: two phones' exports of 10,000 readings each, merged.

Both phones start from the same 8,000 readings of the demo plant's machines (copied with
new ids and times across 20 invented machines); then each goes its own way: phone A edits
the notes of 400 readings and deletes 300, phone B edits 400 (100 of them those A edited:
conflicts), deletes 200 others and edits the 5 cards A edited too; each adds 2,000 readings of
its own, and A ticks 50 checklists. `make_exports` gives both files (JSON-ready, for the
in-browser measurement); `merge_row` times, natively, what an import on phone A runs:
checking B's file (`checked_export`) and merging it (`merge`). Medians of --repeat.
Nothing here asserts a time; the target (issue 16) is under 2 s on the phone profile in
the browser, measured there.

    python -m sitebuild.bench_merge [--repeat N]      (from the repository's root)
"""

from __future__ import annotations

import argparse
import json
import statistics
import time
from datetime import date, datetime, timedelta, timezone

from calc.machines import checkmarks, demo, records, revisions, sync

MACHINES = 20
SHARED = 8_000
OWN = 2_000
EDITS, SAME_EDITS, CARD_EDITS = 400, 100, 5
DELETES_A, DELETES_B = 300, 200
CHECKS = 50
DAY = date(2026, 6, 1)
OFFSET = timezone(timedelta(hours=2))  # the invented plant's clock


def _stamp(minutes: int) -> str:
    start = datetime.combine(DAY, datetime.min.time(), OFFSET) - timedelta(days=900)
    return (start + timedelta(minutes=minutes)).isoformat()


def _readings(machines: list[dict], templates: list[dict], first: int, count: int,
              tag: str) -> list[dict]:
    made = []
    for n in range(first, first + count):
        template = templates[n % len(templates)]
        stamp = _stamp(n * 97)
        made.append(revisions.first_rev({
            **template, "id": f"{tag}{n:06d}", "machine": machines[n % MACHINES]["id"],
            "demo": False, "time": stamp, "updated": stamp}))
    return made


def make_exports() -> tuple[dict, dict]:
    """(phone A's export, phone B's export), each with 10,000 readings, made by calc."""
    plant = demo.plant(DAY)
    cards = [m["card"] for m in plant["machines"]]
    machines = [revisions.first_rev({
        "format": records.MACHINE, "version": records.VERSION, "id": f"bench-{i:02d}",
        "card": {**cards[i % len(cards)], "name": f"Bench press {i + 1:02d}"},
        "updated": _stamp(0)}) for i in range(MACHINES)]
    shared = _readings(machines, plant["readings"], 0, SHARED, "s")
    a = {"machines": list(machines), "readings": list(shared), "checks": []}
    b = {"machines": list(machines), "readings": list(shared), "checks": []}
    late = _stamp(SHARED * 97 + 1)
    for phone, first, deletes, who in ((a, 0, DELETES_A, "A"),
                                       (b, EDITS - SAME_EDITS, DELETES_B, "B")):
        readings = phone["readings"]
        for n in range(first, first + EDITS):
            readings[n] = revisions.revised(
                {**readings[n], "note": f"Checked again on phone {who}"}, late)
        # A deletes the last DELETES_A shared readings, B as many just before those.
        end = SHARED - (0 if who == "A" else DELETES_A)
        for n in range(end - deletes, end):
            readings[n] = revisions.deleted(readings[n], late)
        for n in range(CARD_EDITS):
            phone["machines"][n] = revisions.revised(
                {**machines[n], "card": {**machines[n]["card"],
                                         "notes": f"Edited on phone {who}"}},
                late)
    a["readings"] += _readings(machines, plant["readings"], SHARED, OWN, "a")
    b["readings"] += _readings(machines, plant["readings"], SHARED, OWN, "b")
    a["checks"] = [checkmarks.new_results("checklist-water", machines[n % MACHINES]["id"],
                                          (DAY - timedelta(days=n)).isoformat(),
                                          {"condensation/look-inside": "pass"}, {}, "", late)
                   for n in range(CHECKS)]
    return (sync.export_file(a, late)["file"], sync.export_file(b, late)["file"])


def merge_row(repeat: int = 3) -> dict:
    """Native times (ms) of importing B's file on phone A: the file checked, then merged."""
    mine, theirs = make_exports()
    local = [doc for kind in sync.KINDS for doc in mine[kind]]
    # As travel.merge_file: what phone A holds at the same revision is not read again.
    held = frozenset(sync.held_key(kind, doc) for kind in sync.KINDS for doc in mine[kind])
    text = json.dumps(theirs)
    checked_ms, merge_ms, said = [], [], ""
    for _ in range(repeat):
        data = json.loads(text)
        started = time.perf_counter()
        found = sync.checked_export(data, None, held)
        middle = time.perf_counter()
        merged = sync.merge(local, [doc for kind in sync.KINDS for doc in found[kind]])
        done = time.perf_counter()
        checked_ms.append((middle - started) * 1000)
        merge_ms.append((done - middle) * 1000)
        said = merged["message"]
    return {"readings_each": len(mine["readings"]), "file_bytes": len(text.encode()),
            "repeat": repeat, "check_ms": statistics.median(checked_ms),
            "merge_ms": statistics.median(merge_ms),
            "total_ms": statistics.median(c + m for c, m in zip(checked_ms, merge_ms)),
            "message": said}


# In the page: phone A's calc merges phone B's file through the worker, as an import does
# (what this phone holds the same goes as its key: kit.narrowed; the database writes after
# it are not timed). The files go in first, outside the timing.
BROWSER_MERGE = """async ([mine, theirs]) => {
  const kit = await import(new URL("js/kit.js", document.baseURI).href);
  const started = performance.now();
  const [incoming, local] = kit.narrowed(theirs, mine);
  const merged = await kit.ask("merge", { local, incoming, time: kit.localStamp() });
  if (!merged.ok) throw new Error(JSON.stringify(merged.errors));
  return [performance.now() - started, merged.message];
}"""


def browser_row(browser, url: str, repeat: int, throttle_cls, rate: float, phone: dict) -> dict:
    """The merge timed in the app's worker, renderers at CPU / `rate` (bench.Throttle)."""
    mine, theirs = make_exports()
    local = {kind: mine[kind] for kind in sync.KINDS}
    context = browser.new_context(viewport=phone, service_workers="block")
    page = context.new_page()
    runs, said = [], ""
    try:
        page.goto(url + "#/cautions")
        page.wait_for_selector("html[data-ready]", timeout=300_000)
        with throttle_cls(rate):
            for _ in range(repeat):
                ms, said = page.evaluate(BROWSER_MERGE, [local, theirs])
                runs.append(ms)
    finally:
        context.close()
    return {"readings_each": len(mine["readings"]), "rate": rate, "repeat": repeat,
            "merge_ms": statistics.median(runs), "runs": runs, "message": said}


def table(row: dict) -> str:
    return "\n".join([
        f"Merge of two exports, {row['readings_each']:,} readings each ({row['file_bytes']:,} "
        f"bytes; native CPython, median of {row['repeat']})",
        f"| {'step':<36} | {'ms':>7} |",
        "|" + "|".join("-" * w for w in (38, 9)) + "|",
        f"| {'the file checked (checked_export)':<36} | {row['check_ms']:>7,.0f} |",
        f"| {'merged with this phone (merge)':<36} | {row['merge_ms']:>7,.0f} |",
        f"| {'import in all':<36} | {row['total_ms']:>7,.0f} |",
        f"It said: {row['message']}",
    ])


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    print(table(merge_row(parser.parse_args(argv).repeat)))


if __name__ == "__main__":
    main()
