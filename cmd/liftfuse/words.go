package main

import (
	"strings"

	"github.com/spf13/cobra"

	"liftfuse/methods/campaign"
)

// words writes a list as in a sentence (campaign.Words, the one owner);
// an empty list is "".
func words(list []string, conj string) string {
	if len(list) == 0 {
		return ""
	}
	return campaign.Words(list, conj)
}

// enum returns the allowed word that value names, in any case, or an
// input error listing the words.
func enum(flag, value string, allowed ...string) (string, error) {
	for _, a := range allowed {
		if strings.EqualFold(value, a) {
			return a, nil
		}
	}
	return "", badInput("--%s must be %s, got %q", flag, words(allowed, "or"), value)
}

// requireFlags returns one input error naming every required flag that
// was not given.
func requireFlags(cmd *cobra.Command, names ...string) error {
	var missing []string
	for _, n := range names {
		if cmd.Flags().Changed(n) {
			continue
		}
		if f := cmd.Flags().Lookup(n); f != nil && f.Shorthand != "" {
			missing = append(missing, "-"+f.Shorthand)
		} else {
			missing = append(missing, "--"+n)
		}
	}
	if len(missing) == 0 {
		return nil
	}
	noun := "missing required flag"
	if len(missing) > 1 {
		noun += "s"
	}
	return badInput("%s %s", noun, words(missing, "and"))
}
