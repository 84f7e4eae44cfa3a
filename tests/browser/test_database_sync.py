"""Sync with the plant's database, against a CouchDB-protocol server the tests start on
127.0.0.1 (pouchdb-server from npm, in memory) behind the app's own origin, as the plant's
reverse proxy puts it (sitebuild/serve.py passes /db/ on to it).

Two phones that make readings offline meet on both after sync; a card edited on both is
kept both ways until a technician chooses, then settled everywhere; a sync cut half-way goes
on where it stopped and loses nothing; hostile documents from the server are refused and the
page goes on working. What the documents mean is calc's (tests/calc/test_database.py).
Machines and places are invented."""

from __future__ import annotations

import json
import socket
import subprocess
import time
import urllib.error
import urllib.parse
import urllib.request
from contextlib import contextmanager

import pytest

from sitebuild import serve

from .conftest import BOOT_TIMEOUT_MS, PHONE, ROOT, Watch, add_machine, open_app
from .test_sharing import _edit_card, _held, _reading

SERVER = ROOT / "node_modules" / "pouchdb-server" / "bin" / "pouchdb-server"
SYNC = 'await import(new URL("js/sync.js", document.baseURI).href)'
KIT = 'await import(new URL("js/kit.js", document.baseURI).href)'
PAYLOAD = '<img src=x onerror="window.__pwned=1"><script>window.__pwned=1</script>'


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Plant:
    """The database server and the app served in front of it."""

    def __init__(self, couch: str, base: str):
        self.couch, self.base = couch, base

    def ask(self, method: str, path: str, body=None):
        data = None if body is None else json.dumps(body).encode()
        request = urllib.request.Request(self.couch + path, data=data, method=method,
                                         headers={"Content-Type": "application/json"})
        with urllib.request.urlopen(request, timeout=30) as answer:
            return json.loads(answer.read())

    def docs(self, db: str) -> dict:
        rows = self.ask("GET", f"/{db}/_all_docs?include_docs=true")["rows"]
        return {row["id"]: row["doc"] for row in rows}


@pytest.fixture(scope="module")
def plant(dist, tmp_path_factory):
    if not SERVER.is_file():
        pytest.fail("node_modules/pouchdb-server is missing: run `make setup`")
    work = tmp_path_factory.mktemp("database")
    port = _free_port()
    process = subprocess.Popen(
        ["node", str(SERVER), "--in-memory", "--port", str(port), "--host", "127.0.0.1",
         "--no-stdout-logs", "--config", str(work / "config.json")],
        cwd=work, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    couch = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 60
    while True:
        try:
            urllib.request.urlopen(couch + "/", timeout=2).read()
            break
        except (urllib.error.URLError, ConnectionError):
            if time.monotonic() > deadline or process.poll() is not None:
                process.kill()
                pytest.fail("pouchdb-server did not start")
            time.sleep(0.3)
    server, base = serve.start_in_thread(dist, database=couch)
    try:
        yield Plant(couch, base)
    finally:
        server.shutdown()
        process.terminate()
        process.wait(timeout=10)


def _page_errors(watch) -> list[str]:
    """The page's errors, but the browser's notes of requests that failed: a replication asks
    for checkpoints that are not there yet (404), and a cut request fails on purpose."""
    return [e for e in watch.errors if not e.startswith("Failed to load resource")]


def _phone(browser, plant):
    watch = Watch()
    context = browser.new_context(viewport=PHONE)
    watch.attach(context)
    page = context.new_page()
    open_app(page, plant.base, "#/machines")
    return context, page, watch


@contextmanager
def _two_phones(browser, plant):
    """Two phones (contexts of their own: storage apart) with the app open; at the end, no
    page error on either."""
    (a_context, a, a_watch), (b_context, b, b_watch) = (_phone(browser, plant),
                                                         _phone(browser, plant))
    try:
        yield a_context, a, b_context, b
        for watch in (a_watch, b_watch):
            assert not _page_errors(watch)
    finally:
        a_context.close()
        b_context.close()


def _turn_on(page, path: str) -> str:
    """Sync turned on as a technician does it; waits for the first round; what it says."""
    open_app(page, page.url.split("#")[0], "#/machines")
    page.fill('[data-sync="path"]', path)
    page.check('[data-sync="on"]')
    status = page.locator('[data-sync="status"]')
    page.wait_for_function("""() => { const s = JSON.parse(localStorage.getItem("sumpside.sync") || "{}");
      return s.last || s.problem; }""", timeout=BOOT_TIMEOUT_MS)
    said = status.inner_text()
    assert said.startswith("Last synced"), said
    return said


def _sync(page) -> dict:
    """One round now (as "Sync now" does), then what the page keeps of it."""
    return page.evaluate(f"""async () => {{
      const sync = {SYNC};
      await sync.syncNow();
      return JSON.parse(localStorage.getItem("sumpside.sync"));
    }}""")


def test_nothing_is_sent_until_sync_is_on_and_the_path_is_checked(browser, plant):
    context, page, watch = _phone(browser, plant)
    sent = []
    context.on("request", lambda r: sent.append(r.url) if "/db/" in r.url else None)
    try:
        add_machine(page, {"name": "Lathe 3, tool room", "grade": "VG 32"})
        _sync(page)  # off: a round does nothing
        status = page.locator('[data-sync="status"]')
        assert status.inner_text().startswith("Sync is off: nothing is sent")
        assert page.locator('[data-sync="now"]').is_disabled()
        for typed in ("http://example.invalid/db", "//example.invalid/db", "/db/../admin", "db"):
            page.fill('[data-sync="path"]', typed)
            page.click('[data-sync="on"]')  # the page refuses: the box unticks itself
            assert not page.is_checked('[data-sync="on"]')
            assert page.locator('[data-sync="path-error"]').is_visible()
        assert sent == [] and not page.evaluate("'PouchDB' in window")
        assert _turn_on(page, "/db/lathe-room").startswith("Last synced today")
        # The database and its server's root (PouchDB asks it who the server is): this origin.
        assert sent and all(u.startswith(plant.base + "db/") for u in sent)
        assert any(u.startswith(plant.base + "db/lathe-room/") for u in sent)
        assert [d for d in plant.docs("lathe-room") if d.startswith("machine:")]
        page.uncheck('[data-sync="on"]')
        before = len(sent)
        add_machine(page, {"name": "Lathe 4, tool room", "grade": "VG 32"})
        _sync(page)
        assert len(sent) == before and "Sync is off" in status.inner_text()
        assert not _page_errors(watch)
    finally:
        context.close()


def test_readings_made_offline_on_two_phones_meet_on_both_after_sync(browser, plant):
    with _two_phones(browser, plant) as (a_context, a, b_context, b):
        press = add_machine(a, {"name": "Press 12, east hall", "grade": "VG 46"})
        _reading(a, press, "40")
        assert _turn_on(a, "/db/east-hall").startswith("Last synced today")
        said = _turn_on(b, "/db/east-hall")
        assert "1 card added, 1 reading added" in said

        # Offline, apart: each phone takes readings; B renames the press, A notes its site.
        for context in (a_context, b_context):
            context.set_offline(True)
        mine = [_reading(a, press, t) for t in ("45", "50")]
        theirs = [_reading(b, press, "55")]
        _edit_card(a, press, {"name": "Press 12, east hall", "site": "Bay 4"})
        _edit_card(b, press, {"name": "Press 12 (rebuilt)"})
        kept = _sync(a)
        assert kept["problem"].startswith("no network")
        assert "stopped: no network" in a.locator('[data-sync="status"]').inner_text()

        for context in (a_context, b_context):
            context.set_offline(False)
        _sync(a)
        assert _sync(b)["said"].startswith("2 readings added")
        _sync(a)
        held_a, held_b = _held(a), _held(b)
        assert held_a == held_b
        assert set(mine + theirs) <= set(held_a["readings"]) and len(held_a["readings"]) == 4
        assert held_a["machines"][0][3] == 1  # the card edited on both: kept both ways
        assert len([d for d in plant.docs("east-hall") if d.startswith("reading:")]) == 4

        # B chooses on the machine's page; the choice reaches A at its next sync.
        open_app(b, plant.base, "#/machine/" + press)
        b.locator('[data-m="conflict"]').locator("text=Keep the card shown now").click()
        b.locator('[data-m="conflict"]').wait_for(state="hidden")
        _sync(b)
        assert "1 card updated" in _sync(a)["said"]
        assert _held(a) == _held(b) and _held(a)["machines"][0][3] == 0


def test_a_sync_cut_half_way_goes_on_where_it_stopped_and_loses_nothing(browser, plant):
    with _two_phones(browser, plant) as (a_context, a, b_context, b):
        saw = add_machine(a, {"name": "Saw 2, cutting shop", "grade": "VG 46"})
        made = a.evaluate(f"""async (id) => {{
          const kit = {KIT};
          const machine = await kit.machine(id);
          for (let i = 0; i < 450; i++) {{
            const saved = await kit.ask("save", {{ tool: "viscosity-at-temperature", units: "metric", time: kit.localStamp(),
              inputs: {{ oil_from: "grade", grade: "VG 46", vi: "100", temp: String(20 + (i % 60)), pump: "vane" }}, machine }});
            if (!saved.ok) throw new Error(JSON.stringify(saved.errors));
            await kit.keepReading(saved);
          }}
          return (await kit.allReadings()).length;
        }}""", saw)
        assert made == 450
        # The second batch of documents sent is cut off, as a lost network cuts it.
        batches = []

        def cut(route):
            batches.append(route.request.url)
            if len(batches) == 2:
                route.abort("connectionreset")
            else:
                route.continue_()
        a_context.route("**/db/cutting-shop/_bulk_docs*", cut)
        open_app(a, plant.base, "#/machines")
        a.fill('[data-sync="path"]', "/db/cutting-shop")
        a.check('[data-sync="on"]')
        status = a.locator('[data-sync="status"]')
        status.filter(has_text="stopped").wait_for(timeout=BOOT_TIMEOUT_MS)
        assert "stopped: the database could not be reached" in status.inner_text()
        on_server = [d for d in plant.docs("cutting-shop") if d.startswith("reading:")]
        assert 0 < len(on_server) < 450
        a_context.unroute("**/db/cutting-shop/_bulk_docs*")
        kept = _sync(a)
        assert kept["problem"] is None
        assert len([d for d in plant.docs("cutting-shop") if d.startswith("reading:")]) == 450
        assert "1 card added, 450 readings added" in _turn_on(b, "/db/cutting-shop")
        assert _held(a) == _held(b)


def test_hostile_documents_from_the_server_are_refused_and_the_page_goes_on(browser, plant):
    with _two_phones(browser, plant) as (a_context, a, b_context, b):
        pump = add_machine(a, {"name": "Pump set 1, harbour crane", "grade": "VG 46"})
        _reading(a, pump, "40")
        _turn_on(a, "/db/harbour")
        held = plant.docs("harbour")
        reading = next(d for k, d in held.items() if k.startswith("reading:"))
        card = held["machine:" + pump]
        strip = lambda doc: {k: v for k, v in doc.items() if k != "_rev"}  # noqa: E731
        hostile = {
            # Script in every string a record shows: taken as text, shown as text.
            "machine:xss": {**strip(card), "_id": "machine:xss", "id": "xss",
                            "card": {**card["card"], "name": PAYLOAD, "site": PAYLOAD,
                                     "notes": PAYLOAD}},
            "reading:xss": {**strip(reading), "_id": "reading:xss", "id": "xss",
                            "machine": "xss", "note": PAYLOAD},
            # Wrong types, huge values, ids that do not match, not the kit's at all.
            "reading:types": {**strip(reading), "_id": "reading:types", "id": "types",
                              "inputs": [1, 2], "time": 5, "rev": {"n": 1}},
            "reading:huge": {**strip(reading), "_id": "reading:huge", "id": "huge",
                             "note": "x" * 2_000_000},
            "machine:deep": {**strip(card), "_id": "machine:deep", "id": "deep",
                             "card": json.loads("[" * 40 + "]" * 40)},
            "machine:other": {**strip(card), "_id": "machine:other"},
            "junk:" + PAYLOAD: {"_id": "junk:" + PAYLOAD, "format": PAYLOAD, 1: 2},
            "plain": {"_id": "plain", "hello": "world"},
        }
        for doc_id, doc in hostile.items():
            plant.ask("PUT", "/harbour/" + urllib.parse.quote(doc_id, safe=""), doc)
        b.on("dialog", lambda d: (_ for _ in ()).throw(AssertionError("a dialog opened")))
        said = _turn_on(b, "/db/harbour")
        assert "refused" in said and "2 cards added" in said and "2 readings added" in said
        assert b.evaluate("window.__pwned") is None
        open_app(b, plant.base, "#/machines")
        b.locator(".machine-list a", has_text="Pump set 1").wait_for()
        assert b.locator(".machine-list a", has_text="<img").count() == 1  # the name, as text
        open_app(b, plant.base, "#/machine/xss")
        b.locator('[data-m="name"]', has_text="<img").wait_for()
        assert b.evaluate("window.__pwned") is None
        # The page still works: a reading made now goes out with the next round.
        late = _reading(b, pump, "60")
        assert _sync(b)["problem"] is None
        # A takes it, with the records B took, and refuses what B refused.
        assert _sync(a)["said"].startswith("1 card added, 2 readings added, 1 reading refused, "
                                           "5 database documents refused")
        assert late in _held(a)["readings"] and _held(a) == _held(b)
        assert a.evaluate("window.__pwned") is None


def test_sync_asked_for_during_a_round_runs_one_more_round_after_it(browser, plant):
    # The round under way may have read this phone's records before a change just made:
    # asking again queues one round after it (one, however often it is asked meanwhile).
    context, page, watch = _phone(browser, plant)
    try:
        add_machine(page, {"name": "Mill 7, gear shop", "grade": "VG 68"})
        _turn_on(page, "/db/gear-shop")
        rounds = page.evaluate(f"""async () => {{
          const sync = {SYNC};
          const last = () => JSON.parse(localStorage.getItem("sumpside.sync")).last;
          const first = sync.syncNow(), second = sync.syncNow(), third = sync.syncNow();
          await first;
          const one = last();
          await second;
          return {{ queued: first !== second, once: second === third, one, two: last() }};
        }}""")
        assert rounds["queued"] and rounds["once"]
        assert rounds["one"] and rounds["two"] and rounds["one"] != rounds["two"], rounds
        assert not _page_errors(watch)
    finally:
        context.close()
