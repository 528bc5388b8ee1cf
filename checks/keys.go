package checks

import (
	"crypto/sha256"
	"encoding/hex"
	"strconv"
	"strings"
)

// A finding's key names what it is about, so that a reviewer's decision on
// it can follow the manuscript from version to version: the check's id,
// the claim's id (when it is about one) and the finding's topic, joined by
// colons,
//
//	equivalence:C1:across-equivalents
//	graph-fit:independence.long_commute-maths_score
//
// A topic is a kind (lower case, hyphens) and, where one check can say the
// same kind of thing about several subjects, a subject after a dot: the
// variables, an alternative's name made a slug, a nearby graph's edits. No
// number a check computes and no wording goes into a key, so the same
// finding on a resubmission with other figures keeps its key. Check ids,
// claim ids (^[A-Za-z0-9_.-]{1,32}$) and topics hold no colon, so keys are
// distinct where their parts are, and every key is safe in a URL path.

// topicUnkeyed stands in for a finding whose check set no topic (a test
// holds every check to setting one); dupMark marks a second finding with
// the same key in one check, which a test also holds the checks to avoid.
const (
	topicUnkeyed = "unkeyed"
	dupMark      = "~"
)

// FindingKey composes the key of a finding of check id.
func FindingKey(check string, f Finding) string {
	parts := []string{check}
	if f.Claim != "" {
		parts = append(parts, f.Claim)
	}
	t := f.Topic
	if t == "" {
		t = topicUnkeyed
	}
	return strings.Join(append(parts, t), ":")
}

// keyFindings gives each finding of a check its key; a key seen before in
// the same check gets a count ("~2"), so keys stay unique within a report.
func keyFindings(check string, fs []Finding) {
	seen := map[string]int{}
	for i := range fs {
		k := FindingKey(check, fs[i])
		seen[k]++
		if n := seen[k]; n > 1 {
			k += dupMark + strconv.Itoa(n)
		}
		fs[i].Key = k
	}
}

// TopicKind is a topic without its subject: what kind of finding it is.
func TopicKind(topic string) string {
	kind, _, _ := strings.Cut(topic, ".")
	return kind
}

// topic joins a kind and its subject's parts: topic("fit", "anxiety-first").
func topic(kind string, subject ...string) string {
	s := strings.Join(subject, "-")
	if s == "" {
		return kind
	}
	return kind + "." + capSubject(s)
}

// maxSubject is the longest subject kept as it is; a longer one keeps its
// start and a hash of the whole, so keys stay short and distinct.
const maxSubject = 96

func capSubject(s string) string {
	if len(s) <= maxSubject {
		return s
	}
	sum := sha256.Sum256([]byte(s))
	return s[:maxSubject-13] + "-" + hex.EncodeToString(sum[:6])
}

// slug makes free text (an alternative's name) a key's subject: lower-case
// ASCII letters and digits, every other run a hyphen; text with none of
// them becomes "x" and a hash of the text.
func slug(text string) string {
	var b strings.Builder
	gap := false
	for _, r := range strings.ToLower(text) {
		if r >= 'a' && r <= 'z' || r >= '0' && r <= '9' {
			if gap && b.Len() > 0 {
				b.WriteByte('-')
			}
			b.WriteRune(r)
			gap = false
			continue
		}
		gap = true
	}
	if b.Len() == 0 {
		sum := sha256.Sum256([]byte(text))
		return "x" + hex.EncodeToString(sum[:4])
	}
	return b.String()
}

// numberSlug writes a data value as a key's subject: 99.5 as 99p5, −9 as m9.
func numberSlug(v float64) string {
	return strings.NewReplacer(".", "p", "-", "m", "+", "").Replace(strconv.FormatFloat(v, 'g', -1, 64))
}

// EnsureKeys keys the findings of a report made before findings had keys
// (a stored report of an earlier version): each check whose findings lack
// one gets them keyed by check, claim and "unkeyed", counted in order.
func EnsureKeys(r *Report) {
	for i := range r.Checks {
		fs := r.Checks[i].Findings
		if len(fs) > 0 && fs[0].Key == "" {
			keyFindings(r.Checks[i].ID, fs)
		}
	}
}
