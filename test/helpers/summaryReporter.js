// Prints one closing line "unit: N passed, N failed" after jest's own report.
class SummaryReporter {
  onRunComplete(_contexts, results) {
    const skipped = results.numPendingTests + results.numTodoTests;
    process.stdout.write(`unit: ${results.numPassedTests} passed, ${results.numFailedTests} failed${skipped ? `, ${skipped} skipped` : ''}\n`);
  }
}
module.exports = SummaryReporter;
