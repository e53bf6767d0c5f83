// Package cmd holds the project's commands; the one users run is clatter.
package cmd
