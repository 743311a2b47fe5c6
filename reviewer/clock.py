"""The time the tool writes into files: now, or ``SOURCE_DATE_EPOCH`` when it is set.

``SOURCE_DATE_EPOCH`` (seconds since 1970-01-01 UTC) is the common convention for reproducible
output (reproducible-builds.org specification): with it set, the same input gives the same
bytes, in reports and in review records alike. A value that is not a whole number is ignored.
"""

from __future__ import annotations

import os
from datetime import datetime, timezone


def moment() -> datetime:
    """The current time in UTC, whole seconds, or the time ``SOURCE_DATE_EPOCH`` gives."""
    fixed = os.environ.get("SOURCE_DATE_EPOCH", "").strip()
    if fixed.isdigit():
        try:
            return datetime.fromtimestamp(int(fixed), tz=timezone.utc)
        except (OverflowError, OSError, ValueError):
            pass
    return datetime.now(timezone.utc).replace(microsecond=0)


def now() -> str:
    """ISO 8601 time stamp in UTC: ``"2026-12-03T12:00:00Z"``."""
    return moment().isoformat().replace("+00:00", "Z")


def today() -> str:
    """ISO 8601 date in UTC: ``"2026-12-03"``."""
    return moment().date().isoformat()
