package accuracy

import "errors"

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrPolicy = errors.New("accuracy: unreadable policy")
)
