"""A decision survives the writer being killed right after record_decision returns."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
from pathlib import Path

from extract.store import open_store
from tests.store.samples import KEY, make_document, sample_proposals

WRITER = """
import sys, time
from extract.store import open_store
store = open_store(sys.argv[1])
decision = store.record_decision(sys.argv[2], curator="ana", action="accept", seconds=2.0)
print(decision.uid, flush=True)
time.sleep(60)
"""


def test_decision_survives_kill_9(tmp_path: Path) -> None:
    path = tmp_path / "durable.sqlite"
    with open_store(path) as store:
        store.add_article(make_document(), extractor_key=KEY)
        store.add_proposals("velorin-kidney", sample_proposals())
        pid = store.proposals()[0].id
    proc = subprocess.Popen(
        [sys.executable, "-c", WRITER, str(path), pid], stdout=subprocess.PIPE, text=True
    )
    assert proc.stdout is not None
    uid = proc.stdout.readline().strip()
    os.kill(proc.pid, signal.SIGKILL)  # no clean shutdown, no checkpoint of the WAL
    proc.wait(timeout=10)
    assert proc.returncode == -signal.SIGKILL
    with open_store(path) as store:
        decisions = list(store.decisions())
        assert [d.uid for d in decisions] == [uid]
        assert store.proposal(pid).state == "accepted"


def test_sqlite_connections_use_wal_and_foreign_keys(tmp_path: Path) -> None:
    # PRAGMA names and values as documented at https://sqlite.org/pragma.html.
    with open_store(tmp_path / "p.sqlite") as store, store.engine.connect() as connection:
        pragma = connection.exec_driver_sql
        assert pragma("PRAGMA journal_mode").scalar() == "wal"
        assert pragma("PRAGMA foreign_keys").scalar() == 1
        assert pragma("PRAGMA synchronous").scalar() == 1  # NORMAL
        assert pragma("PRAGMA busy_timeout").scalar() == 5000
