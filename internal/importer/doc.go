// Package importer reads a practice's existing records from files: CSV
// sheets of body mass or training sessions (any delimiter of the three a
// spreadsheet writes, headers in any order, decimal commas, kg or lb, dates
// in ISO 8601 or day/month/year or month/day/year) and activity files
// recorded by watches and bike computers (GPX, FIT). It only reads and
// checks: every row comes back either as a typed record or as a problem
// naming its line, column and a plain reason. Writing is the store's job.
package importer
