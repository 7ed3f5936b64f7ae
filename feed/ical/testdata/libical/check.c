/*
 * check reads an iCalendar file with libical (the C library behind many
 * calendar servers and clients), runs its RFC 5545/5546 restriction check,
 * and prints what it found, one line each:
 *
 *   ERROR <text>            an X-LIC-ERROR libical attached while parsing or checking
 *   EVENT <uid> <unix>      a timed VEVENT and its DTSTART as a Unix time, the TZID
 *                           resolved through the file's own VTIMEZONE
 *   DAY <uid> <yyyymmdd>    an all-day VEVENT and its DTSTART date
 *
 * Built and run by feed/ical's tests (libical_test.go) when libical's
 * development files are installed: cc check.c $(pkg-config --cflags --libs libical).
 */
#include <libical/ical.h>
#include <stdio.h>
#include <stdlib.h>

static char *slurp(const char *path) {
	FILE *f = fopen(path, "rb");
	if (!f) return NULL;
	fseek(f, 0, SEEK_END);
	long n = ftell(f);
	fseek(f, 0, SEEK_SET);
	char *buf = malloc(n + 1);
	if (fread(buf, 1, n, f) != (size_t)n) { fclose(f); free(buf); return NULL; }
	buf[n] = 0;
	fclose(f);
	return buf;
}

static void errors(icalcomponent *c) {
	for (icalproperty *p = icalcomponent_get_first_property(c, ICAL_XLICERROR_PROPERTY); p;
	     p = icalcomponent_get_next_property(c, ICAL_XLICERROR_PROPERTY))
		printf("ERROR %s: %s\n", icalcomponent_kind_to_string(icalcomponent_isa(c)), icalproperty_get_xlicerror(p));
	for (icalcomponent *k = icalcomponent_get_first_component(c, ICAL_ANY_COMPONENT); k;
	     k = icalcomponent_get_next_component(c, ICAL_ANY_COMPONENT))
		errors(k);
}

int main(int argc, char **argv) {
	if (argc != 2) { fprintf(stderr, "usage: check file.ics\n"); return 2; }
	char *text = slurp(argv[1]);
	if (!text) { perror(argv[1]); return 2; }
	icalcomponent *cal = icalparser_parse_string(text);
	if (!cal || icalcomponent_isa(cal) != ICAL_VCALENDAR_COMPONENT) {
		printf("ERROR not a VCALENDAR\n");
		return 1;
	}
	icalrestriction_check(cal);
	errors(cal);
	for (icalcomponent *ev = icalcomponent_get_first_component(cal, ICAL_VEVENT_COMPONENT); ev;
	     ev = icalcomponent_get_next_component(cal, ICAL_VEVENT_COMPONENT)) {
		struct icaltimetype t = icalcomponent_get_dtstart(ev);
		const char *uid = icalcomponent_get_uid(ev);
		if (icaltime_is_date(t))
			printf("DAY %s %04d%02d%02d\n", uid, t.year, t.month, t.day);
		else
			printf("EVENT %s %lld\n", uid, (long long)icaltime_as_timet_with_zone(t, t.zone ? t.zone : icaltimezone_get_utc_timezone()));
	}
	icalcomponent_free(cal);
	free(text);
	return 0;
}
