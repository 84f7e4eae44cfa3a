"""Two phones that never share a network pass files and end with the same machines and
readings: a card edited on both is kept both ways until a technician chooses on the machine's
page, a deleted reading is deleted on the other phone too, and a reading made on either is on
both. The file's merge rules themselves are calc's (tests/calc/test_sync.py)."""

from __future__ import annotations

import json

from .conftest import BOOT_TIMEOUT_MS, PHONE, Watch, add_machine, open_app

KIT = 'await import(new URL("js/kit.js", document.baseURI).href)'


def _phone(browser, base_url):
    watch = Watch()
    context = browser.new_context(viewport=PHONE)
    watch.attach(context)
    page = context.new_page()
    open_app(page, base_url, "#/machines")
    return context, page, watch


def _reading(page, machine_id: str, temp: str) -> str:
    """A viscosity reading of the machine at `temp`, saved as the Save button saves it."""
    return page.evaluate(f"""async ([id, temp]) => {{
      const kit = {KIT};
      const saved = await kit.ask("save", {{ tool: "viscosity-at-temperature", units: "metric", time: kit.localStamp(),
        inputs: {{ oil_from: "grade", grade: "VG 46", vi: "100", temp, pump: "vane" }}, machine: await kit.machine(id) }});
      if (!saved.ok) throw new Error(JSON.stringify(saved.errors));
      await kit.keepReading(saved);
      return saved.record.id;
    }}""", [machine_id, temp])


def _edit_card(page, machine_id: str, changes: dict) -> None:
    page.evaluate(f"""async ([id, changes]) => {{
      const kit = {KIT};
      const previous = await kit.machine(id);
      const shown = await kit.ask("card-view", {{ machine: previous, units: "metric" }});
      const made = await kit.ask("card-check", {{ card: {{ ...shown.values, ...changes }}, units: "metric", id,
        time: kit.localStamp(), previous }});
      if (!made.ok) throw new Error(JSON.stringify(made.errors));
      await kit.saveMachine(made.machine);
    }}""", [machine_id, changes])


def _pass_file(sender, receiver, tmp_path, name: str) -> str:
    """The sender's file (its Share button: a download here) imported by the receiver; what it said."""
    open_app(sender, sender.url.split("#")[0], "#/machines")
    with sender.expect_download() as download:
        sender.click('[data-kit="export-json"]')
    path = tmp_path / name
    path.write_bytes(open(download.value.path(), "rb").read())
    assert json.loads(path.read_text())["version"] == 2
    open_app(receiver, receiver.url.split("#")[0], "#/machines")
    receiver.set_input_files('[data-kit="import"]', str(path))
    status = receiver.locator("[data-kit-status]")
    status.filter(has_text="Imported").wait_for(timeout=BOOT_TIMEOUT_MS)
    return status.inner_text()


def _held(page) -> dict:
    return page.evaluate(f"""async () => {{
      const kit = {KIT};
      return {{ machines: (await kit.allMachines()).map((m) => [m.id, m.rev, m.card.name, (m.conflicts || []).length]),
               readings: (await kit.allReadings()).map((r) => r.id).sort() }};
    }}""")


def test_two_phones_meet_by_file_and_a_card_edited_on_both_is_settled_once(browser, base_url, tmp_path):
    a_context, a, a_watch = _phone(browser, base_url)
    b_context, b, b_watch = _phone(browser, base_url)
    try:
        press = add_machine(a, {"name": "Press 12, east hall", "grade": "VG 46"})
        first, second = _reading(a, press, "40"), _reading(a, press, "55")
        assert _pass_file(a, b, tmp_path, "a1.json").startswith("Imported: 1 card added, 2 readings added")

        # Apart: B renames the press and deletes a reading; A notes the site and takes a reading.
        _edit_card(b, press, {"name": "Press 12, east hall (rebuilt)"})
        b.evaluate(f"async (id) => {{ const kit = {KIT}; await kit.deleteReading((await kit.allReadings()).find((r) => r.id === id)); }}", first)
        _edit_card(a, press, {"site": "East hall, bay 3"})
        third = _reading(a, press, "70")

        said = _pass_file(a, b, tmp_path, "a2.json")
        assert "1 reading added" in said and "1 conflict to settle" in said
        said = _pass_file(b, a, tmp_path, "b1.json")
        assert "1 reading deleted" in said and "conflict" in said
        assert sorted(_held(a)["readings"]) == sorted([second, third]) == _held(b)["readings"]

        # A settles on its machine page, keeping the version not shown; the choice travels to B.
        open_app(a, base_url, f"#/machine/{press}")
        box = a.locator('[data-m="conflict"]')
        box.wait_for(timeout=BOOT_TIMEOUT_MS)
        shown, other = box.locator("tbody tr", has_text="Name").locator("td").all_inner_texts()
        assert {shown, other} == {"Press 12, east hall", "Press 12, east hall (rebuilt)"}
        box.locator("text=Keep the other version").click()
        a.wait_for_function("() => document.querySelector('[data-m=conflict]').hidden", timeout=BOOT_TIMEOUT_MS)
        assert a.inner_text('[data-m="name"]') == other
        _pass_file(a, b, tmp_path, "a3.json")
        assert _held(a) == _held(b)
        assert _held(a)["machines"][0][2:] == [other, 0]
        # Once met, a file passed again is nothing new either way.
        assert _pass_file(b, a, tmp_path, "b2.json").startswith("Imported: nothing new")
        assert not a_watch.errors and not b_watch.errors
    finally:
        a_context.close()
        b_context.close()


def test_a_checklists_marks_and_notes_travel_with_the_file(browser, base_url, tmp_path):
    a_context, a, a_watch = _phone(browser, base_url)
    b_context, b, b_watch = _phone(browser, base_url)
    try:
        name, view = "checklist-water", "#view-tool-checklist-water"
        # Each check's result is kept per checklist and day with no machine chosen ("none").
        open_app(a, base_url, f"#/tool/{name}")
        first = a.locator(f"{view} [data-check]").first
        first.locator('[data-check-state][value="fail"]').check()
        first.locator("[data-check-note]").fill("Drain valve opened, 0.2 L of water")
        a.fill(f"{view} [data-checklist-note]", "Checked with the shift lead")
        assert "1 checklist result added" in _pass_file(a, b, tmp_path, "a1.json")
        open_app(b, base_url, f"#/tool/{name}")
        first = b.locator(f"{view} [data-check]").first
        assert first.locator('[data-check-state][value="fail"]').is_checked()
        assert first.locator("[data-check-note]").input_value() == "Drain valve opened, 0.2 L of water"
        assert b.locator(f"{view} [data-checklist-note]").input_value() == "Checked with the shift lead"
        # Passed back unchanged, it is nothing new.
        assert _pass_file(b, a, tmp_path, "b1.json").startswith("Imported: nothing new")
        assert not a_watch.errors and not b_watch.errors
    finally:
        a_context.close()
        b_context.close()


def test_a_file_narrowed_before_it_goes_to_calc_merges_exactly_as_the_whole(browser, base_url):
    """js/kit.js `narrowed` sends a document this phone holds the same as its id alone, and
    only the phone's documents the file otherwise names: calc must answer exactly as it does
    for the whole file and every document (tests/calc/test_sync.py makes the records)."""
    from calc.machines import revisions, sync
    from tests.calc.test_sync import T1, T2, _card, _edit, _everything, _reading

    mine = _everything()
    theirs = {kind: list(docs) for kind, docs in mine.items()}
    card = _card()
    theirs["readings"] += [_reading(card, "75", T2), "junk", dict(_reading(card, "80"), tracked="x")]
    theirs["readings"][0] = _edit(theirs["readings"][0], T2, note="topped up after the sample")
    theirs["machines"][0] = revisions.settle(
        theirs["machines"][0], theirs["machines"][0]["conflicts"][0]["rev"], T2)
    mine["machines"].append(_edit(_card("Mill 2", "mill-2"), T1, card={"name": "Mill 2 (north)"}))
    file = {"format": sync.EXPORT, "version": sync.EXPORT_VERSION, "exported": T2, **theirs}
    context = browser.new_context(viewport=PHONE)
    try:
        page = context.new_page()
        open_app(page, base_url, "#/machines")
        whole, narrow, sizes = page.evaluate(f"""async ([file, mine]) => {{
          const kit = {KIT};
          const ask = (incoming, local) => kit.ask("merge", {{ incoming, local, time: "2026-03-07T10:00:00+01:00" }});
          const [incoming, local] = kit.narrowed(file, mine);
          const count = (docs) => Object.values(docs).filter(Array.isArray).reduce((n, d) => n + d.length, 0);
          return [await ask(file, mine), await ask(incoming, local),
                  [incoming.readings.filter((d) => d.held_here).length, count(local), count(mine)]];
        }}""", [file, mine])
    finally:
        context.close()
    assert whole["ok"] and whole == narrow
    assert sizes[0] == 3 and sizes[1] < sizes[2]  # held ones went as ids, fewer of mine went
    assert whole["reasons"][0].startswith("reading 6: ")
