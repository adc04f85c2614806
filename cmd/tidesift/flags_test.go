package main

import (
	"context"
	"reflect"
	"testing"
)

// Flags → options: each command's flags reach its options, and bad command
// lines fail with the exact message and exit status 2.

func TestImportFlags(t *testing.T) {
	cases := []struct {
		name    string
		args    []string
		want    importOptions
		wantErr string
	}{
		{name: "files and note", args: []string{"import", "a.csv", "b.csv", "--note", "first"},
			want: importOptions{Files: []string{"a.csv", "b.csv"}, Note: "first"}},
		{name: "all flags", args: []string{"import", "x.json", "--format", "json", "--dry-run", "--skip-invalid", "--max-errors", "5"},
			want: importOptions{Files: []string{"x.json"}, Format: "json", DryRun: true, SkipInvalid: true, MaxErrors: 5}},
		{name: "foreign layout", args: []string{"import", "t.xlsx", "--map", "m.toml", "--sheet", "Moons", "--skip-invalid", "--rejects", "r.csv"},
			want: importOptions{Files: []string{"t.xlsx"}, Map: "m.toml", Sheet: "Moons", SkipInvalid: true, Rejects: "r.csv"}},
		{name: "suggest a map", args: []string{"import", "--suggest-map", "f.vot", "--table", "moons"},
			want: importOptions{Files: []string{"f.vot"}, SuggestMap: true, Table: "moons"}},
		{name: "suggest-map with map", args: []string{"import", "--suggest-map", "f.csv", "--map", "m.toml"},
			wantErr: "--suggest-map only reads the files' columns; it takes none of --map, --dry-run, --skip-invalid"},
		{name: "votable table", args: []string{"import", "t.vot", "--table", "2"},
			want: importOptions{Files: []string{"t.vot"}, Table: "2"}},
		{name: "rejects without skip-invalid", args: []string{"import", "a.csv", "--rejects", "r.csv"},
			wantErr: "--rejects needs --skip-invalid (without it, a file with a bad row is refused whole)"},
		{name: "rejects with two files", args: []string{"import", "a.csv", "b.csv", "--skip-invalid", "--rejects", "r.csv"},
			wantErr: "--rejects takes one FILE to import, not 2; import the files one at a time"},
		{name: "db from the global flag", args: []string{"--db", "other.db", "import", "a.csv"},
			want: importOptions{DB: "other.db", Files: []string{"a.csv"}}},
		{name: "no file", args: []string{"import"}, wantErr: "requires at least 1 arg(s), only received 0"},
		{name: "bad format", args: []string{"import", "a.csv", "--format", "yaml"},
			wantErr: `invalid argument "yaml" for "--format" flag: want csv, tsv, json, xlsx or votable`},
		{name: "negative max errors", args: []string{"import", "a.csv", "--max-errors", "-1"},
			wantErr: "invalid --max-errors -1: want a count ≥ 1, or 0 for the default"},
		{name: "unknown flag", args: []string{"import", "a.csv", "--force"}, wantErr: "unknown flag: --force"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			ta := newTestApp(t)
			var got *importOptions
			cmd := newImportCmd(ta.app, func(_ context.Context, o *importOptions) error { got = o; return nil })
			err, code := execute(t, ta.app, cmd, tc.args...)
			if tc.wantErr != "" {
				if err == nil || err.Error() != tc.wantErr || code != exitUsage {
					t.Fatalf("error %v (exit %d), want %q (exit %d)", err, code, tc.wantErr, exitUsage)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if tc.want.DB == "" {
				tc.want.DB = "tidesift.db" // the default, no TIDESIFT_DB in the test's environment
			}
			got.app = nil
			if !reflect.DeepEqual(*got, tc.want) {
				t.Errorf("options\n got %+v\nwant %+v", *got, tc.want)
			}
		})
	}
}

func TestListShowFlags(t *testing.T) {
	ta := newTestApp(t)
	var lo *listOptions
	cmd := newListCmd(ta.app, func(_ context.Context, o *listOptions) error { lo = o; return nil })
	if err, _ := execute(t, ta.app, cmd, "list", "-f", "csv", "--planet", "Velmira b", "--star", "Velmira", "--rev", "2"); err != nil {
		t.Fatal(err)
	}
	if lo.Format != "csv" || lo.Planet != "Velmira b" || lo.Star != "Velmira" || lo.Revision != 2 || lo.DB != "tidesift.db" {
		t.Errorf("list options %+v", *lo)
	}

	var so *showOptions
	cmd = newShowCmd(ta.app, func(_ context.Context, o *showOptions) error { so = o; return nil })
	if err, _ := execute(t, ta.app, cmd, "show", "Ilmeth", "--format", "json", "--planet", "Velmira b"); err != nil {
		t.Fatal(err)
	}
	if so.Name != "Ilmeth" || so.Format != "json" || so.Planet != "Velmira b" {
		t.Errorf("show options %+v", *so)
	}
}

func TestUsageErrors(t *testing.T) {
	cases := []struct {
		name    string
		args    []string
		wantErr string
	}{
		{"show without a name", []string{"show"}, "accepts 1 arg(s), received 0"},
		{"show with two names", []string{"show", "a", "b"}, "accepts 1 arg(s), received 2"},
		{"list bad format", []string{"list", "--format", "xml"}, `invalid argument "xml" for "-f, --format" flag: want table, json or csv`},
		{"list extra argument", []string{"list", "x"}, `unknown command "x" for "tidesift list"`},
		{"list negative rev", []string{"list", "--rev", "-3"}, "invalid --rev -3: want a revision number ≥ 1, or 0 for the latest"},
		{"revisions csv", []string{"revisions", "--format", "csv"}, `invalid argument "csv" for "-f, --format" flag: want table or json`},
		{"unknown command", []string{"rnak"}, `unknown command "rnak" for "tidesift"`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			ta := newTestApp(t)
			code := runCLI(t, ta, tc.args...)
			if code != exitUsage {
				t.Errorf("exit %d, want %d", code, exitUsage)
			}
			if got := ta.errOut.String(); !containsLine(got, "tidesift: "+tc.wantErr) {
				t.Errorf("stderr %q, want a line %q", got, "tidesift: "+tc.wantErr)
			}
		})
	}
}

func containsLine(s, line string) bool {
	for len(s) > 0 {
		i := 0
		for i < len(s) && s[i] != '\n' {
			i++
		}
		if s[:i] == line {
			return true
		}
		if i == len(s) {
			break
		}
		s = s[i+1:]
	}
	return false
}

func TestDBDefault(t *testing.T) {
	for _, tc := range []struct {
		env, want string
	}{{"", "tidesift.db"}, {"team.db", "team.db"}} {
		ta := newTestApp(t)
		ta.env["TIDESIFT_DB"] = tc.env
		var got *listOptions
		root := newBareRootCmd(ta.app)
		root.AddCommand(newListCmd(ta.app, func(_ context.Context, o *listOptions) error { got = o; return nil }))
		root.SetArgs([]string{"list"})
		if err := root.Execute(); err != nil {
			t.Fatal(err)
		}
		if got.DB != tc.want {
			t.Errorf("TIDESIFT_DB=%q: db %q, want %q", tc.env, got.DB, tc.want)
		}
	}
}

func TestRankFlags(t *testing.T) {
	ta := newTestApp(t)
	var got *rankOptions
	cmd := newRankCmd(ta.app, func(_ context.Context, o *rankOptions) error { got = o; return nil })
	err, _ := execute(t, ta.app, cmd, "rank", "--top", "3", "--planet", "Velmira b", "--planet", "Teodra b", "--star", "Velmira",
		"--samples", "500", "--seed", "42", "--profile", "tidal", "--workers", "1", "--format", "json", "--rev", "2")
	if err != nil {
		t.Fatal(err)
	}
	want := rankFlags{Top: 3, Planets: []string{"Velmira b", "Teodra b"}, Stars: []string{"Velmira"},
		Samples: 500, Seed: 42, Profile: "tidal", Workers: 1, Revision: 2}
	if !reflect.DeepEqual(got.rankFlags, want) || got.Format != "json" {
		t.Errorf("rank options\n got %+v %q\nwant %+v json", got.rankFlags, got.Format, want)
	}

	// Defaults: 10,000 samples, seed 1, the ocean profile, all targets.
	cmd = newRankCmd(ta.app, func(_ context.Context, o *rankOptions) error { got = o; return nil })
	if err, _ := execute(t, ta.app, cmd, "rank"); err != nil {
		t.Fatal(err)
	}
	if d := got.rankFlags; d.Samples != 10000 || d.Seed != 1 || d.Profile != "ocean" || d.Top != 0 || got.Format != "table" {
		t.Errorf("rank defaults %+v %q", d, got.Format)
	}
}

func TestRankExportDiffFlagErrors(t *testing.T) {
	cases := []struct {
		args    []string
		wantErr string
	}{
		{[]string{"rank", "--samples", "0"}, "invalid --samples 0: want at least 1"},
		{[]string{"rank", "--top", "-1"}, "invalid --top -1: want a count ≥ 1, or 0 for all"},
		{[]string{"rank", "--workers", "-2"}, "invalid --workers -2: want a count ≥ 1, or 0 for one per CPU"},
		{[]string{"rank", "--seed", "-1"}, `invalid argument "-1" for "--seed" flag: strconv.ParseUint: parsing "-1": invalid syntax`},
		{[]string{"rank", "--format", "xlsx"}, `invalid argument "xlsx" for "-f, --format" flag: want table, json or csv`},
		{[]string{"export"}, "nothing to write to: give --out FILE.xlsx, or --format csv or json for standard output"},
		{[]string{"export", "--out", "r.ods"}, `cannot tell the format of --out "r.ods" from its extension; give --format xlsx, csv or json`},
		{[]string{"export", "--format", "xlsx"}, "a workbook needs --out FILE.xlsx (it is not written to standard output)"},
		{[]string{"export", "--format", "json", "--since", "2"}, "--since needs a workbook (--format xlsx): CSV and JSON hold one ranking"},
		{[]string{"diff", "1"}, "accepts 2 arg(s), received 1"},
		{[]string{"diff", "1", "-3"}, "unknown shorthand flag: '3' in -3"},
		{[]string{"diff", "1", "x"}, `invalid revision "x": want a revision number (0: the latest)`},
		{[]string{"history"}, "accepts between 1 and 2 arg(s), received 0"},
		{[]string{"history", "Ilmeth", "colour"}, `unknown key "colour"; want one of ` + keyList()},
		{[]string{"profile", "show"}, "accepts 1 arg(s), received 0"},
	}
	for _, tc := range cases {
		t.Run(tc.args[0]+" "+tc.wantErr, func(t *testing.T) {
			ta := newTestApp(t)
			if code := runCLI(t, ta, tc.args...); code != exitUsage {
				t.Errorf("exit %d, want %d; stderr %q", code, exitUsage, ta.errOut)
			}
			if !containsLine(ta.errOut.String(), "tidesift: "+tc.wantErr) {
				t.Errorf("stderr %q, want the line %q", ta.errOut, "tidesift: "+tc.wantErr)
			}
		})
	}
}

func TestExportFormatFromExtension(t *testing.T) {
	for _, tc := range []struct{ out, want string }{
		{"review.xlsx", "xlsx"}, {"R.CSV", "csv"}, {"ranking.json", "json"},
	} {
		ta := newTestApp(t)
		var got *exportOptions
		cmd := newExportCmd(ta.app, func(_ context.Context, o *exportOptions) error { got = o; return nil })
		if err, _ := execute(t, ta.app, cmd, "export", "--out", tc.out, "--since", "0"); err != nil {
			t.Fatal(err)
		}
		if got.Format != tc.want || got.Out != tc.out {
			t.Errorf("--out %s: format %q, want %q", tc.out, got.Format, tc.want)
		}
	}
}
