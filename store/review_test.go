package store_test

import (
	"crypto/sha256"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// Every decision is kept, newest last, with the label of the key that made
// it; another office sees none of them; the chain of a manuscript's
// versions holds each version's newest decision per finding and its report.
func TestAnnotations(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	editor, _ := mustKey(t, db, "Office R", service.RoleEditor)
	other, _ := mustKey(t, db, "Office Q", service.RoleEditor)
	v1, _, _ := db.CreateSubmission(ctx, newSub(editor, "h1", ""))
	v2, _, _ := db.CreateSubmission(ctx, newSub(editor, "h2", ""))
	saveReport(t, db, v1.ID, 40)
	for _, n := range []service.NewAnnotation{
		{Key: "equivalence:C1:across-equivalents", Decision: service.DecisionNote},
		{Key: "equivalence:C1:across-equivalents", Decision: service.DecisionDismiss, Reason: "settled by design"},
		{Key: "alternatives:none-stated", Decision: service.DecisionAsk, Question: "Which other orders?"},
	} {
		if _, err := db.Annotate(ctx, v1.ID, editor.Scope(), editor, n); err != nil {
			t.Fatal(err)
		}
	}
	hist, err := db.Annotations(ctx, v1.ID, editor.Scope())
	if err != nil || len(hist) != 3 || hist[1].Decision != service.DecisionDismiss || hist[1].By != editor.Label ||
		hist[1].ByKeyID != editor.ID || hist[2].Question != "Which other orders?" || hist[0].ID >= hist[1].ID {
		t.Fatalf("history %+v, %v", hist, err)
	}
	if _, err := db.Annotations(ctx, v1.ID, other.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("another office reads the decisions: %v", err)
	}
	if _, err := db.Annotate(ctx, v1.ID, other.Scope(), other, service.NewAnnotation{Key: "k",
		Decision: service.DecisionNote}); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("another office decides: %v", err)
	}
	if _, err := db.Annotate(ctx, v1.ID, editor.Scope(), editor, service.NewAnnotation{Key: "k",
		Decision: service.DecisionDismiss}); err == nil {
		t.Fatal("a dismissal without a reason was kept")
	}
	v2s, _ := db.Submission(ctx, v2.ID, editor.Scope())
	chain, err := db.ReviewChain(ctx, v2s, editor.Scope())
	if err != nil || len(chain) != 2 || chain[0].Submission.ID != v1.ID || chain[0].Report == nil ||
		chain[1].Report != nil || len(chain[0].Own) != 2 || len(chain[1].Own) != 0 {
		t.Fatalf("chain %+v, %v", chain, err)
	}
	for _, a := range chain[0].Own {
		if a.Key == "equivalence:C1:across-equivalents" && a.Decision != service.DecisionDismiss {
			t.Errorf("the chain holds an older decision: %+v", a)
		}
	}
}

// A published comment has a 256-bit address that is kept only with its
// SHA-256 beside it, answers anyone who has the address, keeps its address
// when published again, and is gone once withdrawn or once its submission
// is deleted, which the office's deletions then record.
func TestComments(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	editor, _ := mustKey(t, db, "Office C", service.RoleEditor)
	author, _ := mustKey(t, db, "Office C", service.RoleSubmitter)
	other, _ := mustKey(t, db, "Office D", service.RoleEditor)
	sub, _, _ := db.CreateSubmission(ctx, newSub(author, "h1", ""))
	c, created, err := db.PublishComment(ctx, sub.ID, editor.Scope(), editor, []byte(`{"items": []}`), false)
	if err != nil || !created || len(c.Token) < 43 || c.By != editor.Label || c.Title != "A study" {
		t.Fatalf("publish: %+v %v %v", c, created, err)
	}
	var sum []byte
	_ = db.Pool.QueryRow(ctx, `SELECT token_sha256 FROM published_comments`).Scan(&sum)
	if want := sha256.Sum256([]byte(c.Token)); string(sum) != string(want[:]) {
		t.Fatal("the address is not looked up by its SHA-256")
	}
	again, created, err := db.PublishComment(ctx, sub.ID, editor.Scope(), editor, []byte(`{"items": [1]}`), true)
	if err != nil || created || again.Token != c.Token || string(again.Letter) != `{"items": [1]}` ||
		!again.Indexable {
		t.Fatalf("republish: %+v %v %v", again, created, err)
	}
	if got, err := db.PublishedComment(ctx, c.Token); err != nil || got.SubmissionID != sub.ID {
		t.Fatalf("by address: %+v %v", got, err)
	}
	if _, err := db.PublishedComment(ctx, c.Token+"x"); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("a wrong address: %v", err)
	}
	if _, err := db.Comment(ctx, sub.ID, other.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("another office: %v", err)
	}
	if list, err := db.Comments(ctx, editor.Scope(), 10); err != nil || len(list) != 1 {
		t.Fatalf("the office's comments: %v %v", list, err)
	}
	if list, _ := db.Comments(ctx, other.Scope(), 10); len(list) != 0 {
		t.Fatalf("another office lists %d", len(list))
	}
	if err := db.WithdrawComment(ctx, sub.ID, editor.Scope()); err != nil {
		t.Fatal(err)
	}
	if _, err := db.PublishedComment(ctx, c.Token); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("withdrawn: %v", err)
	}
	if err := db.WithdrawComment(ctx, sub.ID, editor.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("withdrawn twice: %v", err)
	}
	c, _, _ = db.PublishComment(ctx, sub.ID, editor.Scope(), editor, []byte(`{}`), false)
	saveReport(t, db, sub.ID, 60)
	if err := db.DeleteSubmission(ctx, sub.ID, editor.Scope()); err != nil {
		t.Fatal(err)
	}
	if _, err := db.PublishedComment(ctx, c.Token); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("the comment of a deleted submission: %v", err)
	}
	d, err := db.Deletion(ctx, sub.ID, editor.Scope())
	if err != nil || d.Title != "A study" || d.ManuscriptID != "M-1" || d.Reports != 1 || !d.Comment ||
		d.By != editor.Label || time.Since(d.At) > time.Minute {
		t.Fatalf("deletion %+v, %v", d, err)
	}
	if _, err := db.Deletion(ctx, sub.ID, author.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("a submitter reads an editor's deletion: %v", err)
	}
	if _, err := db.Deletion(ctx, sub.ID, other.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("another office reads the deletion: %v", err)
	}
}
