package contact

// validSettings reports the first setting out of range, as
// Settings.Validate, but runs the checks only when the settings differ
// from the last ones that passed: a world steps thousands of times with
// the same settings. A setting that is NaN never equals itself, so it is
// checked (and refused) every time.
func (s *Solver) validSettings() error {
	if s.Settings == s.passed {
		return nil
	}
	if err := s.Settings.Validate(); err != nil {
		return err
	}
	s.passed = s.Settings
	return nil
}
