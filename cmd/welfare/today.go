package main

import (
	"context"
	"flag"
	"io"
	"strings"
	"time"

	"welfare/checker/cold"
	"welfare/records"
	"welfare/rules"
)

// clock is the time now; tests set it so "today" is a fixed day.
var clock = time.Now

func todayFlags() (*flag.FlagSet, *checkOpts) {
	o := &checkOpts{}
	fs := flag.NewFlagSet("today", flag.ContinueOnError)
	fs.StringVar(&o.on, "on", "today", "the `DAY`: today, yesterday or YYYY-MM-DD, in the facility's time zone")
	fs.StringVar(&o.at, "at", "", "the time of day `HH:MM` to look from (default: now when the day is today, the end of the day otherwise)")
	fs.BoolVar(&o.plain, "plain", false, "plain text: no box drawing, for a shared screen or a message")
	fs.StringVar(&o.only, "only", "", "comma-separated `DOMAINS` to report (as for check)")
	addLimitsFlags(fs, &o.limits)
	fs.Var(&o.rules, "rules", "add the rule packages in `DIR` (repeatable)")
	fs.BoolVar(&o.rulesOnly, "rules-only", false, "use only the --rules folders, not the built-in rules")
	fs.DurationVar(&o.timeoutPerEval, "rule-timeout", 5*time.Second, "time budget of one rule package on one subject (a `DURATION`)")
	return fs, o
}

func runToday(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs, o := todayFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return &usageError{cmd: "today", msg: countMsg("one records folder", pos)}
	}
	if o.on == "" {
		o.on = "today"
	}
	o.failOn = "significant"
	return checkFolder(ctx, pos[0], o, stdout, stderr)
}

// bareOn lets "welfare check RECORDS --on" mean today: a --on with no
// value after it (last, or followed by another flag) is --on=today.
func bareOn(args []string) []string {
	out := append([]string(nil), args...)
	for i, a := range out {
		if a != "--on" && a != "-on" {
			continue
		}
		if i+1 == len(out) || strings.HasPrefix(out[i+1], "-") {
			out[i] = "--on=today"
		}
	}
	return out
}

// todayView is the moment the morning view describes.
type todayView struct {
	day      records.Day
	at       int       // minutes after midnight, local
	endOfDay bool      // no --at on a day that is not today
	cut      time.Time // records after this instant are not yet written
}

// planToday resolves --on (today, yesterday, a date) and --at in the
// facility's time zone.
func planToday(o *checkOpts, loc *time.Location, now time.Time) (todayView, error) {
	if loc == nil {
		loc = time.UTC
	}
	local := now.In(loc)
	todayDay := records.DayOf(local)
	var v todayView
	switch o.on {
	case "today":
		v.day = todayDay
	case "yesterday":
		v.day = todayDay - 1
	default:
		d, err := records.ParseDay(o.on)
		if err != nil {
			return v, usagef("--on: %v (or today, yesterday)", err)
		}
		v.day = d
	}
	switch {
	case o.at != "":
		m, err := records.ParseClock(o.at)
		if err != nil {
			return v, usagef("--at: %v", err)
		}
		v.at = m
	case v.day == todayDay:
		v.at = local.Hour()*60 + local.Minute()
		v.cut = local
		return v, nil
	default:
		v.endOfDay = true
		v.at = 24 * 60
	}
	mid := v.day.In(loc)
	v.cut = time.Date(mid.Year(), mid.Month(), mid.Day(), v.at/60, v.at%60, 59, 999999999, loc)
	return v, nil
}

func scheduleOf(lim *rules.Limits) *cold.Schedule {
	s, err := cold.NewSchedule(lim.Cold.WorkWarmup)
	if err != nil {
		return nil // the limits loader refused a bad schedule already
	}
	return s
}

// allCommand is the command that shows every finding of the day.
func allCommand(dir string, o *checkOpts, day records.Day) string {
	s := "welfare check " + shellWord(dir) + " --from " + day.String() + " --to " + day.String()
	if o.only != "" {
		s += " --only " + shellWord(o.only)
	}
	return s
}

// shellWord quotes a word for a POSIX shell when it needs it.
func shellWord(s string) string {
	if s != "" && !strings.ContainsAny(s, " \t\n'\"\\$`*?[]#~;&|<>(){}!") {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
