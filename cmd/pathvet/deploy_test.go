package main

import (
	"flag"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gopkg.in/yaml.v3"
)

// The container definitions run real subcommands with real flags: every
// args list in docker-compose.yml and deploy/k8s names a subcommand of
// this binary, and each --flag of serve or work is one they define.
func TestDeploy_CommandsExist(t *testing.T) {
	files, _ := filepath.Glob("../../deploy/k8s/*.yaml")
	files = append(files, "../../docker-compose.yml")
	found := 0
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		var doc any
		if err := yaml.Unmarshal(b, &doc); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		for _, args := range commandLists(doc) {
			found++
			checkCommand(t, f, args)
		}
	}
	if found < 4 { // compose, migration job, API and worker deployments
		t.Fatalf("found %d commands", found)
	}
}

// commandLists finds every "args" or "command" list of strings.
func commandLists(v any) [][]string {
	var out [][]string
	switch x := v.(type) {
	case map[string]any:
		for k, val := range x {
			if list, ok := val.([]any); ok && (k == "args" || k == "command") {
				var args []string
				for _, a := range list {
					args = append(args, a.(string))
				}
				out = append(out, args)
				continue
			}
			out = append(out, commandLists(val)...)
		}
	case []any:
		for _, e := range x {
			out = append(out, commandLists(e)...)
		}
	}
	return out
}

func checkCommand(t *testing.T, file string, args []string) {
	switch args[0] {
	case "serve", "work":
		cfg := defaultConfig(func(string) string { return "" })
		fs := flag.NewFlagSet(args[0], flag.ContinueOnError)
		fs.SetOutput(io.Discard)
		cfg.bindServerFlags(fs, args[0] == "serve")
		for _, a := range args[1:] {
			if name, ok := strings.CutPrefix(a, "--"); ok && fs.Lookup(strings.SplitN(name, "=", 2)[0]) == nil {
				t.Errorf("%s: %s has no flag %s", file, args[0], a)
			}
		}
		if err := fs.Parse(args[1:]); err != nil {
			t.Errorf("%s: %v: %v", file, args, err)
		}
	case "migrate":
		if len(args) != 2 || (args[1] != "up" && args[1] != "status") {
			t.Errorf("%s: %v", file, args)
		}
	default:
		t.Errorf("%s: %q is not a subcommand", file, args[0])
	}
}
