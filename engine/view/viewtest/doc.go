// Package viewtest holds the test helpers that check what package view and
// the report page make with tools from outside the project: the Khronos
// glTF validator (the npm package gltf-validator, run by Node.js) and a
// headless Chromium. Each installs its tool when missing and skips the
// test with a clear message when it cannot. ReadPNG reads the pictures
// and screenshots both packages' tests look at.
package viewtest
