"""The report time: ``SOURCE_DATE_EPOCH`` when set (reproducible builds), else now, always in UTC."""

from __future__ import annotations

import datetime
import os

__all__ = ["format_report_time", "report_time"]


def report_time() -> datetime.datetime:
    """The time to print on a report.

    Returns
    -------
    datetime.datetime
        ``SOURCE_DATE_EPOCH`` (seconds since 1970-01-01 UTC) when that environment variable is set, else the
        current time; timezone-aware, UTC.

    Raises
    ------
    ValueError
        When ``SOURCE_DATE_EPOCH`` is set but is not a whole number of seconds.
    """
    epoch = os.environ.get("SOURCE_DATE_EPOCH")
    if epoch is None:
        return datetime.datetime.now(datetime.UTC)
    try:
        seconds = int(epoch)
    except ValueError:
        raise ValueError(
            f"SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01 UTC, got {epoch!r}"
        ) from None
    return datetime.datetime.fromtimestamp(seconds, datetime.UTC)


def format_report_time(moment: datetime.datetime) -> str:
    """``moment`` as printed on a report, in UTC.

    Parameters
    ----------
    moment : datetime.datetime
        Timezone-aware time.

    Raises
    ------
    ValueError
        When ``moment`` has no timezone (its UTC time would be a guess).

    Examples
    --------
    >>> format_report_time(datetime.datetime(2024, 5, 1, 9, 30, tzinfo=datetime.timezone.utc))
    '2024-05-01 09:30 UTC'
    """
    if moment.tzinfo is None or moment.utcoffset() is None:
        raise ValueError("rendered_at must be timezone-aware, e.g. datetime.datetime.now(datetime.timezone.utc)")
    return moment.astimezone(datetime.UTC).strftime("%Y-%m-%d %H:%M UTC")
