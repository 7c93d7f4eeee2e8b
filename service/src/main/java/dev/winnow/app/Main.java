package dev.winnow.app;

/** Command-line entry: {@code serve} or {@code demo}. Wiring lands with the foundation. */
public final class Main {
    private Main() {
    }

    public static void main(String[] args) {
        System.out.println("usage: java -jar winnow.jar serve|demo");
    }
}
