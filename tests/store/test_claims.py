"""Claims: two curators never review the same proposal at once."""

from __future__ import annotations

import json
import subprocess
import sys
import time
from pathlib import Path

import pytest

from extract.errors import StoreError
from extract.store import Store, open_store
from tests.store.samples import KEY, make_document, sample_proposals


@pytest.fixture
def two_stores(tmp_path: Path) -> tuple[Store, Store]:
    path = tmp_path / "shared.sqlite"
    first = open_store(path)
    first.add_article(make_document(), extractor_key=KEY)
    first.add_proposals("velorin-kidney", sample_proposals())
    second = open_store(path)
    yield first, second  # type: ignore[misc]
    first.close()
    second.close()


def test_claim_is_exclusive_across_store_objects(two_stores: tuple[Store, Store]) -> None:
    ana, bo = two_stores
    pid = ana.proposals("velorin-kidney")[0].id
    assert ana.claim(pid, "ana")
    assert not bo.claim(pid, "bo")
    assert ana.claim(pid, "ana")  # renewing one's own claim works
    assert bo.claimed_by(pid) == "ana"
    with pytest.raises(StoreError, match="claimed by ana"):
        bo.record_decision(pid, curator="bo", action="reject", reason="duplicate")
    assert list(bo.decisions()) == []
    assert ana.release(pid, "ana")
    assert bo.claim(pid, "bo")


def test_expired_claim_can_be_taken_over(two_stores: tuple[Store, Store]) -> None:
    ana, bo = two_stores
    pid = ana.proposals("velorin-kidney")[0].id
    assert ana.claim(pid, "ana", ttl_seconds=0.05)
    time.sleep(0.1)
    assert bo.claimed_by(pid) is None
    assert bo.claim(pid, "bo")
    assert not ana.claim(pid, "ana")


def test_next_pending_skips_others_claims_and_decided(two_stores: tuple[Store, Store]) -> None:
    ana, bo = two_stores
    order = [s.id for s in ana.proposals("velorin-kidney")]
    first = ana.next_pending("velorin-kidney", "ana", claim=True)
    assert first is not None and first.id == order[0]
    second = bo.next_pending("velorin-kidney", "bo")
    assert second is not None and second.id == order[1]
    bo.record_decision(order[1], curator="bo", action="accept")
    third = bo.next_pending("velorin-kidney", "bo")
    assert third is not None and third.id == order[2]
    # Ana still gets her own claimed proposal back.
    again = ana.next_pending("velorin-kidney", "ana")
    assert again is not None and again.id == order[0]


def test_next_pending_none_when_all_done(filled: Store) -> None:
    for state in filled.proposals("velorin-kidney"):
        filled.record_decision(state.id, curator="ana", action="accept")
    assert filled.next_pending("velorin-kidney", "ana") is None


CLAIMER = """
import json, sys, time
from extract.store import open_store
store = open_store(sys.argv[1])
ids = json.loads(sys.argv[3])
while time.time() < float(sys.argv[4]):
    time.sleep(0.005)
won = [pid for pid in ids if store.claim(pid, sys.argv[2])]
print(json.dumps(won))
"""


def test_claims_from_two_processes_never_overlap(tmp_path: Path) -> None:
    path = tmp_path / "race.sqlite"
    with open_store(path) as store:
        store.add_article(make_document(), extractor_key=KEY)
        many = [p.with_changes(id=f"{p.id}-{i}") for i in range(15) for p in sample_proposals()]
        store.add_proposals("velorin-kidney", many)
        ids = [s.id for s in store.proposals()]
    start = str(time.time() + 1.5)  # both start claiming at the same moment
    procs = [
        subprocess.Popen(
            [sys.executable, "-c", CLAIMER, str(path), name, json.dumps(ids), start],
            stdout=subprocess.PIPE,
            text=True,
        )
        for name in ("ana", "bo")
    ]
    won = [set(json.loads(proc.communicate(timeout=60)[0])) for proc in procs]
    assert all(proc.returncode == 0 for proc in procs)
    assert won[0].isdisjoint(won[1])
    assert won[0] | won[1] == set(ids)
    with open_store(path) as store:
        for pid in ids:
            assert store.claimed_by(pid) == ("ana" if pid in won[0] else "bo")
