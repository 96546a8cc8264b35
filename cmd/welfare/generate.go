package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"welfare/records/synth"
	"welfare/records/synth/review"
)

type generateOpts struct {
	animals, days int
	seed          uint64
	failing       bool
}

func generateFlags() (*flag.FlagSet, *generateOpts) {
	o := &generateOpts{}
	fs := flag.NewFlagSet("generate", flag.ContinueOnError)
	fs.IntVar(&o.animals, "animals", 1000, fmt.Sprintf("`N` animals, one to a cage: sheds of fifty, and ten dogs in an indoor kennel (at least %d)", synth.MinAnimals))
	fs.IntVar(&o.days, "days", 365, fmt.Sprintf("`D` days from %s (%d to %d)", synth.Start.Format("2006-01-02"), synth.MinDays, synth.MaxDays))
	fs.Uint64Var(&o.seed, "seed", 1, "`S`: the same seed writes the same bytes")
	fs.BoolVar(&o.failing, "failing", false, fmt.Sprintf("the failing farm: every enclosure fails every check it can, every day (the reports' worst case; --days from %d)", synth.MinFailingDays))
	return fs, o
}

// runGenerate writes a synthetic records folder and its answer key.
func runGenerate(_ context.Context, args []string, stdout, _ io.Writer) error {
	fs, o := generateFlags()
	pos, err := parseArgs(fs, args)
	if err != nil {
		return err
	}
	if len(pos) != 1 {
		return &usageError{cmd: "generate", msg: countMsg("one folder to write", pos)}
	}
	minDays := synth.MinDays
	if o.failing {
		minDays = synth.MinFailingDays
	}
	if o.animals < synth.MinAnimals || o.days < minDays || o.days > synth.MaxDays {
		return &usageError{cmd: "generate", msg: fmt.Sprintf("--animals %d --days %d: at least %d animals and %d to %d days",
			o.animals, o.days, synth.MinAnimals, minDays, synth.MaxDays)}
	}
	// Never write over a records folder: the generated files have the same names.
	if entries, err := os.ReadDir(pos[0]); err == nil && len(entries) > 0 {
		return &usageError{cmd: "generate", msg: fmt.Sprintf("%s is not empty: give a new or empty folder (generate would overwrite its record files)", pos[0])}
	}
	planted, err := synth.Generate(pos[0], synth.Options{Animals: o.animals, Days: o.days, Seed: o.seed, Review: review.Write, Failing: o.failing})
	if err != nil {
		return err
	}
	if o.failing {
		fmt.Fprintf(stdout, "wrote %s: the failing farm, %d animals over %d days, %d finding(s) listed in %s\n",
			pos[0], o.animals, o.days, len(planted), filepath.Join(pos[0], synth.PlantedFile))
		return nil
	}
	needs := 0
	for _, p := range planted {
		if p.Needs == synth.NeedsPrevious {
			needs++
		}
	}
	fmt.Fprintf(stdout, "wrote %s: %d animals over %d days, %d planted finding(s) listed in %s (%d of them found only with --previous %s)\n",
		pos[0], o.animals, o.days, len(planted), filepath.Join(pos[0], synth.PlantedFile), needs, filepath.Join(pos[0], filepath.FromSlash(synth.PreviousFile)))
	return nil
}
