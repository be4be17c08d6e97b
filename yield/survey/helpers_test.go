package survey_test

import (
	"context"
	"errors"
	"testing"

	"sunstring/yield/survey"
)

// memFiles is a ReadFunc over files held in memory, by the path the site file resolves; a
// path not among them is a bad-input "no such file".
func memFiles(files map[string]string) survey.ReadFunc {
	return func(path, what string) ([]byte, error) {
		if b, ok := files[path]; ok {
			return []byte(b), nil
		}
		return nil, notFound{errors.New(path + ": no such " + what)}
	}
}

// runSurvey loads cfg over files and runs the whole survey, failing the test on any error.
func runSurvey(t *testing.T, cfg *survey.Config, files map[string]string) *survey.Result {
	t.Helper()
	p, err := survey.Load(cfg, memFiles(files))
	if err != nil {
		t.Fatal(err)
	}
	res, err := p.Run(context.Background(), survey.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return res
}
