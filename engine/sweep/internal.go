package sweep

import (
	"context"
	"fmt"
	"runtime/debug"
)

// InternalError is a panic in a trial, caught in its worker so that the
// study stops with its finished trials kept instead of the process dying.
// It is a fault of the program, not of the input: the command reports it
// as an internal error.
type InternalError struct {
	Trial int64  // global index of the trial
	Value any    // what was panicked with
	Stack string // the worker's stack at the panic
}

func (e *InternalError) Error() string {
	return fmt.Sprintf("internal error in trial %d: %v", e.Trial, e.Value)
}

// safeRun runs trial g, turning a panic into an *InternalError.
func (wk *worker) safeRun(ctx context.Context, g int64) (r result, err error) {
	defer func() {
		if p := recover(); p != nil {
			err = &InternalError{Trial: g, Value: p, Stack: string(debug.Stack())}
		}
	}()
	return wk.run(ctx, g)
}
