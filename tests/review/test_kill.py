"""A `winnow review` killed with SIGKILL mid-way keeps every decision it made before the kill."""

from __future__ import annotations

import fcntl
import os
import pty
import signal
import struct
import sys
import termios
import time
from pathlib import Path

from extract.store import open_store
from tests.review.scenario import ARTICLE, build_store, make_proposals

WINNOW = Path(sys.executable).with_name("winnow")
IDS = [p.id for p in make_proposals(ARTICLE)]


def _wait_for(predicate, timeout: float = 30.0) -> bool:  # type: ignore[no-untyped-def]
    deadline = time.monotonic() + timeout
    while time.monotonic() < deadline:
        if predicate():
            return True
        time.sleep(0.05)
    return False


def _logged_decisions(log_file: Path) -> list[tuple[str, str]]:
    """(action, proposal id) of each decision the app logged after the store returned."""
    if not log_file.exists():
        return []
    found = []
    for line in log_file.read_text(encoding="utf-8").splitlines():
        words = line.split()
        if len(words) >= 3 and words[-3] == "kim":
            found.append((words[-2], words[-1]))
    return found


def test_decisions_made_before_a_sigkill_are_all_stored(tmp_path: Path) -> None:
    db = tmp_path / "kill.sqlite"
    build_store(db).close()
    log_file = tmp_path / "review.log"
    command = [str(WINNOW), "review", "--db", str(db), "--curator", "kim"]
    command += ["--article", ARTICLE, "--log", str(log_file)]
    pid, fd = pty.fork()
    if pid == 0:  # the child: a terminal of 100x30 running the app
        os.execv(command[0], command)
    try:
        fcntl.ioctl(fd, termios.TIOCSWINSZ, struct.pack("HHHH", 30, 100, 0, 0))
        screen = bytearray()

        def drain() -> None:
            os.set_blocking(fd, False)
            try:
                while chunk := os.read(fd, 65536):
                    screen.extend(chunk)
            except (BlockingIOError, OSError):
                pass

        def shows(text: bytes) -> bool:
            drain()
            return text in screen

        assert _wait_for(lambda: shows(b"Accept")), "the review screen did not appear"
        keys = ["a", "s", "a", "r", "2"]
        expected = [("accept", IDS[0]), ("skip", IDS[1]), ("accept", IDS[2]), ("reject", IDS[3])]
        done = 0
        for key in keys:
            os.write(fd, key.encode())
            if key != "r":
                done += 1
                assert _wait_for(lambda n=done: len(_logged_decisions(log_file)) >= n)
        os.write(fd, b"a")  # one more key, racing the kill: stored or not, never half-stored
        os.kill(pid, signal.SIGKILL)
        os.waitpid(pid, 0)
    finally:
        os.close(fd)
    before_kill = _logged_decisions(log_file)
    assert before_kill[:4] == expected
    store = open_store(db)
    try:
        stored = [(d.action, d.proposal_id) for d in store.decisions(curator="kim")]
        assert stored[: len(before_kill)] == before_kill
        assert len(stored) in (4, 5)
        assert store.proposal(IDS[3]).decision.reason == "wrong value"  # type: ignore[union-attr]
        assert store.proposal(IDS[0]).state == "accepted"
    finally:
        store.close()
