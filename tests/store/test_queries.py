"""Articles and proposals: idempotent adds, resumable batches, document order, bad files."""

from __future__ import annotations

from pathlib import Path

import pytest

from extract.errors import StoreError
from extract.store import Store, open_store
from tests.store.samples import KEY, make_document, make_proposal, sample_proposals


def test_add_article_keeps_metadata_and_document(store: Store) -> None:
    document = make_document(doi="10.5555/winnow.velorin.1")
    record = store.add_article(document, extractor_key=KEY)
    # The article id is the DOI when the article states one (proposal record contract).
    assert record.id == "10.5555/winnow.velorin.1"
    assert (record.name, record.file, record.source) == (
        "velorin-kidney",
        "velorin-kidney.pdf",
        "pdf",
    )
    assert record.sha256 == document.sha256 and record.page_count == 2
    assert record.title == document.title
    rebuilt = store.document(record.id)
    assert rebuilt == document  # words are not stored; the sample has none
    assert rebuilt.tables[0].grid() == [["", "Vehicle (n = 9)"], ["Creatol (mg/dL)", "0.42 ± 0.05"]]
    assert rebuilt.tables[0].cell(1, 1).bbox == (150.0, 120.0, 250.0, 140.0)


def test_add_article_is_idempotent_by_sha256(store: Store) -> None:
    first = store.add_article(make_document(), extractor_key=KEY)
    again = store.add_article(make_document(), extractor_key=KEY)
    assert first == again
    assert len(store.articles()) == 1


def test_article_id_falls_back_to_file_stem(store: Store) -> None:
    assert store.add_article(make_document("dexel-liver"), extractor_key=KEY).id == "dexel-liver"


def test_is_processed_tracks_file_and_extractor_versions(store: Store) -> None:
    document = make_document()
    assert not store.is_processed(document.sha256, KEY)
    store.add_article(document, extractor_key=KEY)
    assert store.is_processed(document.sha256, KEY)
    # A newer extractor version must process the file again.
    assert not store.is_processed(document.sha256, "quantities.rules@0.2+tables@0.1")
    assert not store.is_processed("b" * 64, KEY)


def test_add_extraction_stores_article_proposals_and_mark_together(store: Store) -> None:
    document = make_document()
    assert store.add_extraction(document, sample_proposals(), extractor_key=KEY) == 4
    assert store.is_processed(document.sha256, KEY)
    assert store.add_extraction(document, sample_proposals(), extractor_key=KEY) == 0


def test_add_proposals_adds_no_duplicates(store: Store) -> None:
    store.add_article(make_document(), extractor_key=KEY)
    assert store.add_proposals("velorin-kidney", sample_proposals()) == 4
    assert store.add_proposals("velorin-kidney", sample_proposals()) == 0
    assert len(store.proposals("velorin-kidney")) == 4


def test_add_proposals_needs_a_stored_article(store: Store) -> None:
    with pytest.raises(StoreError, match="no article 'ghost'"):
        store.add_proposals("ghost", sample_proposals("ghost"))


def test_proposals_come_in_document_order(filled: Store) -> None:
    # Reading order of a two-column page: the whole left column before the right one, although
    # "quentase" (right column) sits higher on the page than "body mass" (left column); then the
    # table (its caption block comes first on page 2), then the paragraph under it.
    outcomes = [state.proposal.outcome for state in filled.proposals("velorin-kidney")]
    assert outcomes == ["body mass", "quentase", "creatol", "heart rate"]


def test_proposal_roundtrip_and_fresh_state(filled: Store) -> None:
    stored = {state.proposal.id: state for state in filled.proposals()}
    for proposal in sample_proposals():
        state = stored[proposal.id]
        assert state.proposal == proposal
        assert state.current == proposal
        assert state.state == "pending" and state.decision is None


def test_articles_count_states(filled: Store) -> None:
    states = filled.proposals("velorin-kidney")
    filled.record_decision(states[0].id, curator="ana", action="accept")
    filled.record_decision(states[1].id, curator="ana", action="reject", reason="duplicate")
    filled.record_decision(states[2].id, curator="ana", action="edit", after={"value": 0.43})
    filled.record_decision(states[3].id, curator="ana", action="skip")
    filled.undo_last("ana")  # the skip no longer counts: pending again
    (summary,) = filled.articles()
    assert summary.counts() == {
        "pending": 1, "accepted": 1, "edited": 1, "rejected": 1, "added": 0, "skipped": 0,
    }  # fmt: skip
    assert summary.total == 4 and summary.done == 3


def test_two_files_of_one_article_keep_both_documents(store: Store) -> None:
    pdf = make_document(doi="10.5555/winnow.velorin.1")
    xml = make_document(doi="10.5555/winnow.velorin.1", sha="c")
    xml = type(xml)(
        **{**xml.__dict__, "path": "/tmp/articles/velorin-kidney.xml", "source": "jats"}
    )
    store.add_article(pdf, extractor_key=KEY)
    store.add_article(xml, extractor_key=KEY)
    assert len(store.articles()) == 1
    assert store.document("10.5555/winnow.velorin.1", file="velorin-kidney.pdf").source == "pdf"
    assert store.document("10.5555/winnow.velorin.1", file="velorin-kidney.xml").source == "jats"


def test_unknown_article_is_a_store_error(store: Store) -> None:
    with pytest.raises(StoreError, match="ghost"):
        store.article("ghost")
    with pytest.raises(StoreError, match="ghost"):
        store.document("ghost")


def test_manual_proposal_is_added_with_an_add_decision(filled: Store) -> None:
    missed = make_proposal("velorin-kidney", "tail length", 8.5, page=1, bbox=(60, 350, 250, 360))
    state = filled.add_manual_proposal("velorin-kidney", missed, curator="ana")
    assert state.proposal.extractor == "curator@1"
    assert state.state == "added" and state.decision is not None
    assert state.decision.action == "add" and state.decision.after == state.proposal.to_dict()
    outcomes = [s.proposal.outcome for s in filled.proposals("velorin-kidney")]
    assert outcomes.index("tail length") == 1  # left column, below body mass


def test_corrupt_file_gives_one_line_store_error(tmp_path: Path) -> None:
    bad = tmp_path / "notes.sqlite"
    content = b"These are curator notes, not a database.\n" * 50
    bad.write_bytes(content)
    with pytest.raises(StoreError) as caught:
        open_store(bad)
    message = str(caught.value)
    assert str(bad) in message and "not a" in message and "\n" not in message
    assert bad.read_bytes() == content  # nothing already there is lost


def test_folder_as_target_is_a_store_error(tmp_path: Path) -> None:
    with pytest.raises(StoreError, match="is a folder"):
        open_store(tmp_path)


def test_default_target_comes_from_environment(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    monkeypatch.setenv("WINNOW_DB", str(tmp_path / "env" / "store.sqlite"))
    with open_store() as opened:
        opened.add_article(make_document(), extractor_key=KEY)
    assert (tmp_path / "env" / "store.sqlite").is_file()
    monkeypatch.delenv("WINNOW_DB")
    monkeypatch.chdir(tmp_path)
    open_store().close()
    assert (tmp_path / "winnow.sqlite").is_file()


def test_sqlite_url_and_reopen_keep_data(tmp_path: Path) -> None:
    url = f"sqlite:///{tmp_path / 'u.sqlite'}"
    with open_store(url) as first:
        first.add_article(make_document(), extractor_key=KEY)
    with open_store(tmp_path / "u.sqlite") as second:
        assert [a.id for a in second.articles()] == ["velorin-kidney"]


def test_model_versions_are_recorded(store: Store) -> None:
    store.record_model_version("quantities.model", "0.1", path="models/q-0.1", metrics={"f1": 0.8})
    store.record_model_version("quantities.model", "0.2", metrics={"f1": 0.85})
    assert [m.version for m in store.model_versions("quantities.model")] == ["0.1", "0.2"]
    assert store.model_versions()[0].metrics == {"f1": 0.8}
    with pytest.raises(StoreError, match="already recorded"):
        store.record_model_version("quantities.model", "0.1")


def test_migrations_are_named_recorded_and_run_once(tmp_path: Path) -> None:
    from extract.store.migrations import MIGRATIONS, applied_migrations, migrate

    with open_store(tmp_path / "m.sqlite") as first:
        assert applied_migrations(first.engine) == [m.name for m in MIGRATIONS]
        assert migrate(first.engine) == []  # nothing left to apply
    with open_store(tmp_path / "m.sqlite") as again:
        assert applied_migrations(again.engine) == [m.name for m in MIGRATIONS]
