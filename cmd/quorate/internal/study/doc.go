// Package study is the study workspace: the folder that keeps every artefact of one
// reference-set study — its protocol (study.yaml), its secret, the fixed places of each
// stage's outputs, and the provenance log that says which command made what from what.
//
// It lives in the command layer on purpose: domain packages receive paths and values,
// never a workspace, so they can be tested and reused without one.
package study
