// Package sheet renders a published plan for people outside the app: the PDF plan sheet and the iCalendar feed.
package sheet
