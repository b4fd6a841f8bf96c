package main

import (
	"errors"
	"fmt"
	"strings"

	"tonewright/networks"
)

// Exit codes.
const (
	exitOK       = 0
	exitInternal = 1
	exitBadInput = 2
	exitUnmet    = 3
)

// inputError is bad input or usage: exit 2.
type inputError struct{ err error }

func (e *inputError) Error() string { return e.err.Error() }
func (e *inputError) Unwrap() error { return e.err }

func usageErrorf(format string, args ...any) error {
	return &inputError{fmt.Errorf(format, args...)}
}

// badInput marks err as the user's input being wrong.
func badInput(err error) error {
	if err == nil {
		return nil
	}
	return &inputError{err}
}

// unmetError is a finished search whose targets were not all met: exit 3.
type unmetError struct{ msg string }

func (e *unmetError) Error() string { return e.msg }

func exitCode(err error) int {
	var ie *inputError
	var fe *networks.FieldError
	var ue *unmetError
	switch {
	case errors.As(err, &ue):
		return exitUnmet
	case errors.As(err, &ie), errors.As(err, &fe):
		return exitBadInput
	}
	// cobra's own argument errors.
	msg := err.Error()
	for _, p := range []string{"unknown command", "unknown flag", "unknown shorthand", "accepts ", "requires ", "invalid argument"} {
		if strings.Contains(msg, p) {
			return exitBadInput
		}
	}
	return exitInternal
}
