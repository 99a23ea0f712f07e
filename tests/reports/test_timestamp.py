"""The report time (hazard.reports.timestamp): SOURCE_DATE_EPOCH, or now in UTC."""

import datetime

import pytest

from hazard.reports import report_time


def test_report_time_reads_source_date_epoch(monkeypatch):
    # reproducible-builds.org SOURCE_DATE_EPOCH specification: whole seconds since 1970-01-01 00:00 UTC
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1700000000")
    assert report_time() == datetime.datetime(2023, 11, 14, 22, 13, 20, tzinfo=datetime.UTC)
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "yesterday")
    with pytest.raises(ValueError, match="SOURCE_DATE_EPOCH"):
        report_time()
    monkeypatch.delenv("SOURCE_DATE_EPOCH")
    before = datetime.datetime.now(datetime.UTC)
    now = report_time()
    assert now.tzinfo == datetime.UTC and before <= now <= datetime.datetime.now(datetime.UTC)
