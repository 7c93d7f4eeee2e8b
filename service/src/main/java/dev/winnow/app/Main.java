package dev.winnow.app;

import java.util.List;

/** Command-line entry: {@code serve} starts the service; {@code demo} also loads the demo scenario into an empty store. */
public final class Main {
    private Main() {
    }

    public static void main(String[] args) throws Exception {
        String command = args.length == 0 ? "serve" : args[0];
        Config config;
        try {
            config = Config.fromEnvironment(System.getenv());
        } catch (IllegalArgumentException e) {
            System.err.println("winnow: " + e.getMessage());
            System.exit(2);
            return;
        }
        switch (command) {
            case "serve" -> serve(config, false);
            case "demo" -> serve(config, true);
            case "bench" -> Bench.run(args);
            default -> {
                System.err.println("usage: java -jar winnow.jar serve | demo | bench [securities] [dates] | bench serving | bench cross-section [securities] [dates]");
                System.exit(2);
            }
        }
    }

    private static void serve(Config config, boolean demo) throws Exception {
        Winnow winnow;
        try {
            winnow = Winnow.start(config);
        } catch (Winnow.DataDirectoryNotWritableException | Winnow.StoreInUseException e) {
            System.err.println("winnow: " + e.getMessage());
            System.exit(1);
            return;
        }
        Runtime.getRuntime().addShutdownHook(new Thread(winnow::close, "winnow-shutdown"));
        String url = "http://" + config.bind() + ":" + winnow.port();
        if (demo) {
            System.out.println("Loading the demo scenario (invented companies and series) ...");
            List<String> loaded = winnow.loadDemoIfEmpty();
            System.out.println(loaded.isEmpty() ? "The store already holds data; the demo scenario was not loaded again."
                    : "Demo scenario loaded: panel demo-market and factors " + String.join(", ", loaded) + ".");
        }
        System.out.println("Winnow is listening on " + url);
        if (winnow.generatedAdminToken() != null) {
            System.out.println("Admin token (shown once; only its hash is stored): " + winnow.generatedAdminToken());
            System.out.println("Authenticate with:  curl -H 'Authorization: Bearer " + winnow.generatedAdminToken() + "' " + url + "/v1/factors");
        } else {
            System.out.println("Authenticate with the admin token you configured (WINNOW_ADMIN_TOKEN) or one an admin issued:");
            System.out.println("  curl -H \"Authorization: Bearer $TOKEN\" " + url + "/v1/factors");
        }
        Thread.currentThread().join();
    }
}
