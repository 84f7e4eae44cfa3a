"""The plant's database: the kit's records as CouchDB-protocol documents and back, and
phones that sync through one database converge (calc.machines.database).

`RevTree` is a small model of a CouchDB-protocol database, enough for these tests: each
document a tree of revisions, replication copies the revisions the other side lacks, and
the winning leaf is chosen as CouchDB and PouchDB choose it (a live leaf before a deleted
one, then the longest history, then the higher rev id in ASCII order: the CouchDB
documentation, "Replication and conflict model", and pouchdb-merge's `winningRev`).
A phone's sync is what the page does (site_src/js/sync.js): pull, merge every leaf of what
changed (the "database-merge" request), write what the phone holds (the
"database-writes" request), push. The browser tests run the same against pouchdb-server.
Names, machines and places are invented."""

import itertools
import json

from calc.machines import api, database, records, revisions, sync

from .test_sync import T0, T1, T2, T3, _card, _edit, _everything, _reading, _results

_made = itertools.count(1)


class RevTree:
    """Documents as revision trees: {id: {rev: (parent rev or None, body)}}."""

    def __init__(self):
        self.docs: dict[str, dict[str, tuple]] = {}

    def leaves(self, doc_id):
        tree = self.docs[doc_id]
        parents = {parent for parent, _ in tree.values()}
        return [rev for rev in tree if rev not in parents]

    def winner(self, doc_id):
        def order(rev):
            number, digest = rev.split("-", 1)
            return (not self.docs[doc_id][rev][1].get("_deleted", False), int(number), digest)
        return max(self.leaves(doc_id), key=order)

    def bulk(self, docs):
        """Write documents as a client does (new_edits): a child of the `_rev` given, with a
        new rev id; a conflict (a `_rev` that is not a leaf, or none for a held id) is an
        error, as a database answers 409."""
        for doc in docs:
            tree = self.docs.setdefault(doc["_id"], {})
            parent = doc.get("_rev")
            assert (parent is None and not tree) or parent in self.leaves(doc["_id"]), doc
            number = int(parent.split("-")[0]) + 1 if parent else 1
            rev = f"{number}-{next(_made):032x}"
            tree[rev] = (parent, {k: v for k, v in doc.items() if k != "_rev"})

    def replicate_to(self, other):
        for doc_id, tree in self.docs.items():
            other.docs.setdefault(doc_id, {}).update(tree)

    def heads(self):
        """What the page reads of each document (allDocs with conflicts)."""
        found = []
        for doc_id in self.docs:
            win = self.winner(doc_id)
            body = self.docs[doc_id][win][1]
            if body.get("_deleted"):
                continue
            live = [r for r in self.leaves(doc_id)
                    if r != win and not self.docs[doc_id][r][1].get("_deleted")]
            found.append({"_id": doc_id, "_rev": win, "rev": body.get("rev"),
                          "sides": [s.get("rev") for s in body.get("conflicts", [])],
                          "_conflicts": live})
        return found

    def every_leaf(self):
        """Every live leaf of every document, as the page sends them: each its JSON text."""
        return [json.dumps({**self.docs[d][rev][1], "_rev": rev})
                for d in self.docs for rev in self.leaves(d)
                if not self.docs[d][rev][1].get("_deleted")]


class Phone:
    def __init__(self, docs=()):
        self.stored = {doc["id"]: doc for doc in docs}
        self.local = RevTree()

    def by_kind(self):
        return {kind: [d for d in self.stored.values() if sync.kind_of(d) == kind]
                for kind in sync.KINDS}

    def pull_and_merge(self, server):
        server.replicate_to(self.local)
        merged = api.call({"op": "database-merge", "local": self.by_kind(),
                           "leaves": self.local.every_leaf(), "time": T3})
        assert merged["ok"], merged
        for docs in merged["put"].values():
            for doc in docs:
                self.stored[doc["id"]] = doc
        return merged

    def write_and_push(self, server):
        made = api.call({"op": "database-writes", **self.by_kind(), "heads": self.local.heads()})
        assert made["ok"], made
        self.local.bulk(json.loads(json.dumps(made["docs"])))
        self.local.replicate_to(server)
        return made

    def sync(self, server):
        said = self.pull_and_merge(server)["message"]
        self.write_and_push(server)
        return said


def _live_leaves(tree):
    return {d: [r for r in tree.leaves(d) if not tree.docs[d][r][1].get("_deleted")]
            for d in tree.docs}


def test_every_kind_of_record_goes_into_the_database_and_comes_back_as_it_went():
    stored = _everything()
    docs = [database.to_database(kind, doc) for kind in sync.KINDS for doc in stored[kind]]
    assert sorted(d["_id"].split(":")[0] for d in docs) == sorted(
        ["machine"] * 2 + ["reading"] * 4 + ["checklist"] * 2)
    leaves = [json.dumps({**d, "_rev": f"1-{i:032x}"}) for i, d in enumerate(docs)]
    found = database.from_database(leaves)
    assert found["refused"] == 0
    for kind in sync.KINDS:
        assert found["file"][kind] == stored[kind], kind
    fresh = api.call({"op": "database-merge", "local": {}, "leaves": leaves, "time": T3})
    assert fresh["message"] == ("1 card added, 3 readings added, 1 checklist result added, "
                                "1 conflict to settle")  # markers of records never held: kept, not said
    again = api.call({"op": "database-merge", "local": stored, "leaves": leaves, "time": T3})
    assert again["message"] == "nothing new" and not any(again["put"].values())


def test_a_phone_writes_only_what_the_database_lacks_or_holds_at_another_revision():
    card, reading = _card(), _reading(_card())
    phone = Phone([card, reading])
    server = RevTree()
    assert phone.sync(server) == "nothing new"
    assert len(server.docs) == 2
    # Nothing changed: nothing written.
    phone.pull_and_merge(server)
    assert phone.write_and_push(server)["docs"] == []
    phone.stored[card["id"]] = _edit(card, T1, card={"name": "Shear 7 (north bay)"})
    written = phone.write_and_push(server)["docs"]
    assert [d["_id"] for d in written] == ["machine:shear-7"] and written[0]["_rev"]


def test_three_phones_through_the_database_end_the_same():
    """Two phones edit a card apart, a third deletes a reading and adds two; two of them
    push at the same time, so the database itself holds a conflict; all converge, and the
    card's conflict is kept once for the user, as with files (test_sync)."""
    card = _card()
    readings = [_reading(card, temp) for temp in ("40", "50", "60")]
    server = RevTree()
    first = Phone([card, *readings])
    first.sync(server)
    a, b, c = Phone(), Phone(), Phone()
    for phone in (a, b, c):
        assert phone.sync(server) == "1 card added, 3 readings added"
    a.stored[card["id"]] = _edit(card, T1, card={"name": "Shear 7 (north bay)"})
    b.stored[card["id"]] = _edit(card, T2, card={"name": "Shear 7 (new pump)"})
    c.stored[readings[0]["id"]] = revisions.deleted(readings[0], T1)
    for temp in ("70", "80"):
        new = _reading(card, temp, T2)
        c.stored[new["id"]] = new
    # A and B pull, then both push: two children of the same revision in the database.
    a.pull_and_merge(server)
    b.pull_and_merge(server)
    a.write_and_push(server)
    b.write_and_push(server)
    assert len(_live_leaves(server)["machine:shear-7"]) == 2
    said = c.sync(server)
    assert said.startswith("1 card updated") and said.endswith("1 conflict to settle")
    assert len(_live_leaves(server)["machine:shear-7"]) == 1  # C closed the other leaf
    for phone in (a, b, c, a, b):
        phone.sync(server)
    assert a.stored == b.stored == c.stored
    shown = a.stored[card["id"]]
    assert len(shown["conflicts"]) == 1 and sync.to_settle(shown)
    assert sorted(r.get("deleted", False) for r in a.stored.values()
                  if r["format"] == records.READING) == [False] * 4 + [True]
    assert all(len(leaves) == 1 for leaves in _live_leaves(server).values())
    # B settles the card; the others take the settlement at their next sync.
    b.stored[card["id"]] = revisions.settle(shown, shown["conflicts"][0]["rev"], T3)
    assert b.sync(server) == "nothing new"
    assert a.sync(server) == "1 card updated" and c.sync(server) == "1 card updated"
    assert a.stored == b.stored == c.stored and not any(map(sync.to_settle, a.stored.values()))
    for phone in (a, b, c):
        assert phone.sync(server) == "nothing new"
        assert phone.write_and_push(server)["docs"] == []


def test_two_phones_that_close_the_same_conflict_apart_settle_the_next_time_round():
    card = _card()
    server = RevTree()
    a, b = Phone([card]), Phone()
    a.sync(server)
    b.sync(server)
    a.stored[card["id"]] = _edit(card, T1, card={"name": "Shear 7 (a)"})
    b.stored[card["id"]] = _edit(card, T2, card={"name": "Shear 7 (b)"})
    a.pull_and_merge(server), b.pull_and_merge(server)
    a.write_and_push(server), b.write_and_push(server)
    # Both now see the database's conflict, merge it the same way and close it apart.
    a.pull_and_merge(server), b.pull_and_merge(server)
    assert a.stored == b.stored
    a.write_and_push(server), b.write_and_push(server)
    assert len(_live_leaves(server)["machine:shear-7"]) == 2  # the same record, twice
    a.sync(server)
    assert len(_live_leaves(server)["machine:shear-7"]) == 1
    b.sync(server)
    assert a.stored == b.stored and b.write_and_push(server)["docs"] == []


SCRIPT = "<script>alert(1)</script>"


def test_hostile_database_documents_are_refused_and_the_rest_taken():
    good = _reading()
    card = _card()
    deep = {"x": 1}
    for _ in range(20):
        deep = {"x": deep}
    hostile = [
        {"_id": "reading:" + good["id"]},  # no record in it
        {**database.to_database("readings", good), "_id": "reading:other"},
        {**database.to_database("readings", good), "_id": "machine:" + good["id"]},
        {"_id": SCRIPT, "format": SCRIPT},
        {"_id": "design:views", "views": {}},
        {**database.to_database("readings", good), "_id": "reading:" + SCRIPT,
         "id": SCRIPT * 3000},
        {**database.to_database("readings", good), "inputs": deep},
        {**database.to_database("readings", good), "note": SCRIPT * 1000},
        {**database.to_database("readings", good), "tracked": {"oil_temp": "hot"}},
        {**database.to_database("machines", card), "card": {"name": 5, "pump_flow": [1]}},
        {**database.to_database("checks", _results()), "marks": {"a/b": SCRIPT}},
        "junk", None, 12, [good],
    ]
    texts = [json.dumps(d) for d in [database.to_database("readings", good),
                                     database.to_database("machines", card), *hostile,
                                     {"_id": "reading:gone", "_deleted": True}]]
    # Not text, too long, too deep for the parser of a small stack, not JSON.
    texts += [{"_id": "machine:x"}, json.dumps({"_id": "reading:long", "note": "x" * 600_000}),
              "[" * 100_000, '{"_id": "reading:cut", "note": "x']
    answer = api.call({"op": "database-merge", "local": {}, "leaves": texts, "time": T0})
    assert answer["ok"]
    assert [d["id"] for d in answer["put"]["readings"]] == [good["id"]]
    assert [d["id"] for d in answer["put"]["machines"]] == [card["id"]]
    assert answer["not_records"] == 15 and answer["reasons"]
    assert answer["message"] == ("1 card added, 1 reading added, 1 card refused, "
                                 "2 readings refused, 1 checklist result refused, "
                                 "15 database documents refused")
    assert all(len(r) < 300 for r in answer["reasons"])


def test_the_page_requests_refuse_what_is_not_their_shape():
    for bad in ({"leaves": "x"}, {"leaves": [{}] * (sync.DOCS_MAX + 1)}):
        answer = api.call({"op": "database-merge", "local": {}, "time": T0, **bad})
        assert not answer["ok"] and answer["errors"][0]["field"] == "leaves"
    for heads in (None, "x", [{"_id": 1}], [None]):
        answer = api.call({"op": "database-writes", "heads": heads})
        assert not answer["ok"] and answer["errors"][0]["field"] == "heads"
    assert api.call({"op": "database-writes", "heads": []}) == {"ok": True, "docs": [],
                                                                 "closed": 0}
