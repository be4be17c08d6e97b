package weather

import (
	"fmt"
	"time"
)

// OneYearRecords returns how many hourly records make exactly one year for a series whose
// first interval starts at start (on the data's standard-time clock): 8760, or 8784 when the
// year from start includes a 29 February. The dates decide, not the count: 8784 records that
// start on 1 January 2025 are a year and a day.
func OneYearRecords(start time.Time) int {
	return int(start.AddDate(1, 0, 0).Sub(start) / time.Hour)
}

// CheckYear returns an *InputError, named name, unless the series is exactly one year of
// hourly records: a survey's annual figures need that, since a partial year understates them
// and more than a year counts some days twice. The message gives the count, the span and what
// the dates allow.
func (s *Series) CheckYear(name string) error {
	p := &problems{name: name}
	n := 0
	if s != nil {
		n = len(s.Records)
	}
	switch {
	case n == 0:
		p.add(0, "", "no weather records; a survey needs one whole year of hourly records (8760, or 8784 for a leap year)")
	case s.Interval != time.Hour:
		p.add(0, "", "records every %v; a survey needs hourly records (one whole year: 8760, or 8784 for a leap year)", s.Interval)
	default:
		zone := fixedZone(s.TZOffsetHours)
		start := s.Records[0].End.Add(-s.Interval).In(zone)
		if want := OneYearRecords(start); n != want {
			p.add(0, "", "%d hourly records (%s to %s); a survey needs one whole year: exactly 8760 records, or 8784 for a leap year whose dates include 29 February. A year from %s has %d hours: %s",
				n, start.Format("2006-01-02 15:04"), s.Records[n-1].End.In(zone).Format("2006-01-02 15:04"),
				start.Format("2 January 2006"), want, yearAdvice(n, want))
		}
	}
	return p.err()
}

// yearAdvice says what to do about a count of records that is not one year.
func yearAdvice(n, want int) string {
	switch {
	case n < want:
		return fmt.Sprintf("%d hours are missing; complete the year or use another file", want-n)
	case want == 8760 && n == 8784:
		return "the file looks like a leap year stamped with the dates of a common year; check the year in the stamps"
	default:
		return fmt.Sprintf("remove the %d hours beyond one year", n-want)
	}
}
