package dev.winnow.research;

import org.junit.jupiter.api.Test;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;

/** The ordering and failure contract of {@link StudyThreads.Pipeline}, which the IC's chained samples rely on. */
class StudyThreadsTest {

    @Test
    void resultsAreConsumedInSubmissionOrderWhileTasksWaitForEarlierOnes() {
        try (StudyThreads threads = new StudyThreads(2)) {
            List<Integer> seen = new ArrayList<>();
            StudyThreads.Pipeline<Integer> pipeline = threads.pipeline(seen::add);
            CompletableFuture<Integer> previous = CompletableFuture.completedFuture(0);
            for (int i = 1; i <= 500; i++) {
                CompletableFuture<Integer> before = previous;
                CompletableFuture<Integer> own = new CompletableFuture<>();
                int index = i;
                pipeline.submit(() -> {
                    own.complete(before.join() + index); // waits for the task submitted just before
                    return index;
                });
                previous = own;
            }
            pipeline.finish();
            assertEquals(500, seen.size());
            for (int i = 0; i < 500; i++) {
                assertEquals(i + 1, seen.get(i));
            }
            assertEquals(500 * 501 / 2, previous.join());
        }
    }

    @Test
    void aFailureIsThrownOnceTheOthersHaveRunAndThePoolStaysUsable() {
        try (StudyThreads threads = new StudyThreads(2)) {
            for (int round = 0; round < 50; round++) {
                StudyThreads.Pipeline<Void> pipeline = threads.pipeline(done -> { });
                CompletableFuture<Integer> previous = new CompletableFuture<>();
                for (int i = 0; i < StudyThreads.IN_FLIGHT - 1; i++) {
                    CompletableFuture<Integer> before = previous;
                    CompletableFuture<Integer> own = new CompletableFuture<>();
                    boolean first = i == 0;
                    pipeline.submit(() -> {
                        if (first) {
                            own.completeExceptionally(new IllegalStateException("the first task fails"));
                            throw new IllegalStateException("the first task fails");
                        }
                        try {
                            own.complete(before.join() + 1);
                        } catch (RuntimeException e) {
                            own.completeExceptionally(e);
                            throw e;
                        }
                        return null;
                    });
                    previous = own;
                }
                IllegalStateException thrown = assertThrows(IllegalStateException.class, pipeline::finish);
                assertEquals("the first task fails", thrown.getMessage());
            }
            // had a task been skipped, a later one would wait for ever and hold one of the two threads
            assertTimeoutPreemptively(Duration.ofSeconds(20), () -> {
                StudyThreads.Pipeline<Integer> after = threads.pipeline(done -> { });
                for (int i = 0; i < 100; i++) {
                    int index = i;
                    after.submit(() -> index);
                }
                after.finish();
            });
        }
    }
}
