// Prints one plain closing line, "tests: N passed, N failed[, N skipped]", after vitest's own
// summary, so any CI reader that does not know vitest's format still sees what ran.
import type { Reporter, TestModule } from 'vitest/node';

export class ClosingLineReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>): void {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const module of testModules) {
      for (const test of module.children.allTests()) {
        const state = test.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped++;
      }
      if (module.state() === 'failed' && [...module.children.allTests()].length === 0) failed++;
    }
    const tail = skipped > 0 ? `, ${skipped} skipped` : '';
    process.stdout.write(`\ntests: ${passed} passed, ${failed} failed${tail}\n`);
  }
}
