package pipeline

import (
	"context"

	"github.com/chanlint/chanlint/model"
	"github.com/hashicorp/hcl/v2"
	"golang.org/x/sync/semaphore"
)

// MaxParsingTokens bounds the tokens of the files being parsed at once in
// the process, whatever the number of workers: the HCL parser holds about
// 1.5 KB a token while it parses, so that N workers on N dense files
// would otherwise multiply the peak memory by N. It is the budget of one
// file (model.MaxTokens): a file at the budget parses alone, while small
// files (a few thousand tokens each) still parse fully in parallel.
const MaxParsingTokens = model.MaxTokens

// parsing admits files to the parser by their tokens (model.Tokens),
// first come first served.
var parsing = semaphore.NewWeighted(MaxParsingTokens)

// parseAdmitted is model.Parse once src is admitted; its share is
// released however the parse ends.
func parseAdmitted(name string, src []byte) (*model.Model, hcl.Diagnostics) {
	defer admit(src)()
	return parseModel(name, src)
}

// parseModel is the parser; a variable so that a test can watch the
// parses running at once.
var parseModel = model.Parse

// admit waits until src may be parsed and returns the function that
// releases its share.
func admit(src []byte) (release func()) {
	w := int64(min(model.Tokens(src), MaxParsingTokens))
	// The context never ends, so Acquire cannot fail.
	_ = parsing.Acquire(context.Background(), w)
	return func() { parsing.Release(w) }
}
