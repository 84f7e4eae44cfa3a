"""The benchmark's machine-kit row: a phone holding 200 machines and 20,000 readings.

The records are made natively by calc (the demo plant's readings, copied with new ids and
times across 200 machines, one of them holding 1,000) and written into the page's own
database; then, with the renderers held to a quarter of the CPU (bench.Throttle) and the
calculator ready, two figures are timed in the page, each from the address change until
the view is drawn: the machines list (every machine's row) and the page of the machine with
1,000 readings (its latest values, trends and first page of readings). Medians of --repeat.
Nothing here asserts a time.
"""

from __future__ import annotations

import statistics
import sys
from datetime import date, datetime, timedelta, timezone
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from calc.machines import card, condition, demo, records, revisions  # noqa: E402

MACHINES = 200
READINGS = 20_000
BIG = 1_000
RATE = 4
TIMEOUT_MS = 300_000

# Write the records in batches into the page's database (js/db.js), as the kit stores them.
FILL = """async ([machines, readings, digests]) => {
  const db = await import(new URL("js/db.js", document.baseURI).href);
  await db.transact(["machines", "readings", "digests"], "readwrite", (s) => {
    for (const m of machines) s.machines.put(m);
    for (const r of readings) s.readings.put({ ...r, at: Date.parse(r.time) });
    for (const [id, d] of Object.entries(digests)) s.digests.put({ machine: id, ...d });
  });
  return true;
}"""

# Go to `address` from another view; ms from the change until each of `stages` holds (the
# list drawn; a machine's condition, due and trends drawn, then its newest readings listed).
TIME_VIEW = """async ([address, machines]) => {
  const q = (s) => document.querySelectorAll(s).length;
  const stages = address === "#/machines"
    ? [() => q(".machine-item") === machines]
    : [() => !document.querySelector('[data-view="machine"]').hidden && q('[data-m="latest"] tr') > 0
             && q('[data-m="trends"] svg') > 0 && q('[data-m="due"] li') > 0,
       () => q('[data-m="readings"] article') === 20];
  const started = performance.now();
  const times = [];
  location.hash = address;
  return await new Promise((resolve) => {
    const check = () => {
      while (times.length < stages.length && stages[times.length]()) times.push(performance.now() - started);
      if (times.length === stages.length) resolve(times); else requestAnimationFrame(check);
    };
    check();
  });
}"""


def make_records(today: date) -> tuple[list[dict], list[dict], str]:
    """(machines, readings, the id of the machine with BIG readings), made by calc."""
    plant = demo.plant(today)
    templates = plant["readings"]
    cards = [m["card"] for m in plant["machines"]]
    machines = []
    for i in range(MACHINES):
        card = {**cards[i % len(cards)], "name": f"Bench machine {i + 1:03d}"}
        machines.append(revisions.first_rev({
            "format": records.MACHINE, "version": records.VERSION, "id": records.new_id(),
            "card": card, "updated": f"{today.isoformat()}T08:00:00+00:00"}))
    big = machines[0]["id"]
    readings = []
    start = datetime.combine(today, datetime.min.time(), timezone.utc) - timedelta(days=3 * 365)
    for n in range(READINGS):
        owner = big if n < BIG else machines[1 + n % (MACHINES - 1)]["id"]
        template = templates[n % len(templates)]
        when = start + timedelta(minutes=(n * 78839) % (3 * 365 * 24 * 60))
        # Each copy is revision 1 of its own content (never the template's rev).
        readings.append(revisions.first_rev({
            **template, "id": records.new_id(), "machine": owner, "demo": False,
            "time": when.isoformat(), "updated": when.isoformat()}))
    return machines, readings, big


def digests(machines: list[dict], readings: list[dict]) -> dict:
    """Each machine's digest, as the kit keeps it (calc.machines.condition.digest)."""
    by: dict[str, list[dict]] = {}
    for r in readings:
        by.setdefault(r["machine"], []).append(r)
    cards = {m["id"]: m["card"] for m in machines}
    return {key: condition.digest(found, card.facts(cards[key])[0], cards[key])
            for key, found in by.items()}


def machines_row(browser, url: str, repeat: int, throttle_cls, phone: dict) -> dict:
    """Times of the machines list and the big machine's page, renderers at CPU / 4."""
    machines, readings, big = make_records(date.today())
    made = digests(machines, readings)
    context = browser.new_context(viewport=phone, service_workers="allow")
    page = context.new_page()
    try:
        page.goto(url + "#/cautions")
        page.wait_for_selector("html[data-ready]", timeout=TIMEOUT_MS)
        for i in range(0, len(readings), 2000):
            page.evaluate(FILL, [machines if i == 0 else [], readings[i:i + 2000],
                                 made if i == 0 else {}])
        page.reload()
        page.wait_for_selector("html[data-ready]", timeout=TIMEOUT_MS)
        list_ms, page_ms, readings_ms = [], [], []
        with throttle_cls(RATE):
            for _ in range(repeat):
                page.evaluate("() => { location.hash = '#/cautions'; for (const s of ['[data-machine-list]', "
                              "'[data-m=\"latest\"]', '[data-m=\"trends\"]', '[data-m=\"due\"]', "
                              "'[data-m=\"readings\"]']) document.querySelector(s).replaceChildren(); }")
                page.wait_for_timeout(300)
                list_ms.append(page.evaluate(TIME_VIEW, ["#/machines", MACHINES])[0])
                core, listed = page.evaluate(TIME_VIEW, [f"#/machine/{big}", MACHINES])
                page_ms.append(core)
                readings_ms.append(listed)
    finally:
        context.close()
    return {"machines": MACHINES, "readings": READINGS, "big_machine_readings": BIG,
            "rate": RATE, "repeat": repeat,
            "machine_list_ms": statistics.median(list_ms),
            "machine_page_ms": statistics.median(page_ms),
            "machine_page_readings_ms": statistics.median(readings_ms),
            "runs": {"machine_list_ms": list_ms, "machine_page_ms": page_ms,
                     "machine_page_readings_ms": readings_ms}}


def table(row: dict) -> str:
    return "\n".join([
        f"Machine kit, renderer CPU / 4 ({row['machines']} machines, {row['readings']:,} readings; "
        f"median of {row['repeat']}, ms after the calculator is ready)",
        f"| {'view':<44} | {'ms':>7} | {'target':>7} |",
        "|" + "|".join("-" * w for w in (46, 9, 9)) + "|",
        f"| {'machines list (every machine drawn)':<44} | {row['machine_list_ms']:>7,.0f} | {'300':>7} |",
        f"| {'machine page, ' + format(row['big_machine_readings'], ',') + ' readings: condition':<44} "
        f"| {row['machine_page_ms']:>7,.0f} | {'300':>7} |",
        f"| {'  ... and its 20 newest readings listed':<44} "
        f"| {row['machine_page_readings_ms']:>7,.0f} | {'':>7} |",
    ])
