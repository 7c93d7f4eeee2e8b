package dev.winnow.app.seed;

/**
 * The characteristics that follow a latent AR(1) path per company: x_t = phi * x_{t-1} + sqrt(1 - phi^2) * e_t with
 * e_t ~ N(0, 1), so x is stationary N(0, 1) (Hamilton, Time Series Analysis, 1994, section 3.4), and the published
 * value is a fixed transform of x. {@code momentum_12_1} is not here: it is computed from the company's own returns.
 */
enum Characteristic {
    BOOK_TO_PRICE("book_to_price", 0.97) {
        @Override
        double fromLatent(double x) {
            return StrictMath.exp(-0.5 + 0.6 * x);
        }
    },
    GROSS_PROFITABILITY("gross_profitability", 0.95) {
        @Override
        double fromLatent(double x) {
            return 0.28 + 0.12 * x;
        }
    },
    ASSET_GROWTH("asset_growth", 0.92) {
        @Override
        double fromLatent(double x) {
            return 0.07 + 0.12 * x;
        }
    },
    NOISE_ALPHA("noise_alpha", 0.90) {
        @Override
        double fromLatent(double x) {
            return x;
        }
    },
    NOISE_BETA("noise_beta", 0.95) {
        @Override
        double fromLatent(double x) {
            return StrictMath.exp(0.4 * x);
        }
    },
    NOISE_GAMMA("noise_gamma", 0.97) {
        @Override
        double fromLatent(double x) {
            return 50.0 + 12.0 * x;
        }
    };

    private final String column;
    private final double monthlyPersistence;

    Characteristic(String column, double monthlyPersistence) {
        this.column = column;
        this.monthlyPersistence = monthlyPersistence;
    }

    String column() {
        return column;
    }

    /** phi for one step when a month has {@code stepsPerMonth} steps: phi_step = phi_month^(1 / steps). */
    double persistence(int stepsPerMonth) {
        return StrictMath.pow(monthlyPersistence, 1.0 / stepsPerMonth);
    }

    /** One AR(1) step of the latent value with unit stationary variance. */
    static double step(double latent, double persistence, double innovation) {
        return persistence * latent + StrictMath.sqrt(1.0 - persistence * persistence) * innovation;
    }

    abstract double fromLatent(double x);

    /** Index of this characteristic's column in {@link PanelLayout#CHARACTERISTICS}. */
    int columnIndex() {
        return PanelLayout.CHARACTERISTICS.indexOf(column);
    }
}
