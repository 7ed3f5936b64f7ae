"""Expands an iCalendar file with the python recurring-ical-events library
(over python-icalendar) and prints each event: UID, then its start as a UTC
Unix time ("EVENT") or its date ("DAY"). Run by feed/ical's tests
(interop_test.go) when the library is installed (Debian:
python3-recurring-ical-events).

usage: expand.py FILE FIRST-YEAR LAST-YEAR
"""
import datetime
import sys

import icalendar
import recurring_ical_events

with open(sys.argv[1], "rb") as f:
    cal = icalendar.Calendar.from_ical(f.read())
first = datetime.date(int(sys.argv[2]), 1, 1)
last = datetime.date(int(sys.argv[3]) + 1, 1, 1)
for ev in recurring_ical_events.of(cal).between(first, last):
    start = ev["DTSTART"].dt
    if isinstance(start, datetime.datetime):
        print("EVENT", ev["UID"], int(start.timestamp()))
    else:
        print("DAY", ev["UID"], start.strftime("%Y%m%d"))
