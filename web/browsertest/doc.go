// Package browsertest drives the built Lixiv page in Debian's Chromium with
// chromedp. Its tests carry the build tag `browser` and run with
// `make browser`, which builds the page and installs Chromium when missing.
package browsertest
