package dev.winnow.api;

import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.Keys;
import org.openqa.selenium.OutputType;
import org.openqa.selenium.StaleElementReferenceException;
import org.openqa.selenium.TakesScreenshot;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.chrome.ChromeDriver;
import org.openqa.selenium.chrome.ChromeDriverService;
import org.openqa.selenium.chrome.ChromeOptions;
import org.openqa.selenium.logging.LogEntry;
import org.openqa.selenium.logging.LogType;
import org.openqa.selenium.logging.LoggingPreferences;
import org.openqa.selenium.support.ui.WebDriverWait;

import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Comparator;
import java.util.List;
import java.util.logging.Level;
import java.util.regex.Pattern;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * The library page in a real browser: Debian's headless Chromium driven through chromium-driver (WebDriver) over the
 * demo store. It pastes the token, waits for the library, opens a factor from the keyboard and then the themes,
 * checks what is shown (factor names, verdict words, charts whose paths have plotted points) and that the browser
 * console logged no error, and saves screenshots under service/target/browser/.
 *
 * <p>Skips with a message when no Chromium or chromium-driver is installed (set WINNOW_CHROMIUM and
 * WINNOW_CHROMEDRIVER to use other paths); under CI (CI=true) a missing browser is a failure, since .ci/run installs
 * one.
 */
class LibraryPageBrowserTest {
    static final Path SHOTS = Path.of("target", "browser");
    static final Pattern BADGE = Pattern.compile("(significance|stability|breadth|variants|after costs|rationale|redundancy): (holds|weak|fails|not enough data)");

    static TestServer server;
    static ChromeDriver driver;
    static Path profile;

    static String executable(String env, String... candidates) {
        String given = System.getenv(env);
        if (given != null && !given.isBlank()) {
            return Files.isExecutable(Path.of(given)) ? given : null;
        }
        for (String c : candidates) {
            if (Files.isExecutable(Path.of(c))) {
                return c;
            }
        }
        return null;
    }

    @BeforeAll
    static void start() throws Exception {
        String chromium = executable("WINNOW_CHROMIUM", "/usr/bin/chromium", "/usr/bin/chromium-browser");
        String chromedriver = executable("WINNOW_CHROMEDRIVER", "/usr/bin/chromedriver");
        if (chromium == null || chromedriver == null) {
            String message = "No browser for the page test: install Debian's chromium and chromium-driver "
                    + "(apt-get install chromium chromium-driver; .ci/run does) or set WINNOW_CHROMIUM and WINNOW_CHROMEDRIVER.";
            if ("true".equals(System.getenv("CI"))) {
                fail(message + " CI must have one.");
            }
            Assumptions.abort(message);
        }
        server = new TestServer();
        assertEquals(15, server.winnow().loadDemoIfEmpty().size());

        profile = Files.createTempDirectory("winnow-chromium");
        ChromeOptions options = new ChromeOptions();
        options.setBinary(chromium);
        options.addArguments("--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
                "--disable-background-networking", "--disable-component-update", "--disable-sync",
                "--disable-dev-shm-usage", "--window-size=1400,1800", "--user-data-dir=" + profile);
        LoggingPreferences logs = new LoggingPreferences();
        logs.enable(LogType.BROWSER, Level.ALL);
        options.setCapability("goog:loggingPrefs", logs);
        ChromeDriverService service = new ChromeDriverService.Builder()
                .usingDriverExecutable(new File(chromedriver)).usingAnyFreePort().build();
        driver = new ChromeDriver(service, options);
        driver.manage().timeouts().scriptTimeout(Duration.ofSeconds(30));
        Files.createDirectories(SHOTS);
    }

    @AfterAll
    static void stop() throws IOException {
        if (driver != null) {
            driver.quit();
        }
        if (server != null) {
            server.close();
        }
        if (profile != null) {
            try (var files = Files.walk(profile)) {
                files.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    static WebDriverWait waiting(int seconds) {
        // views and charts are replaced as they load: an element found a moment ago may be gone
        WebDriverWait wait = new WebDriverWait(driver, Duration.ofSeconds(seconds), Duration.ofMillis(200));
        wait.ignoring(StaleElementReferenceException.class);
        return wait;
    }

    static void screenshot(String name) throws IOException {
        byte[] png = ((TakesScreenshot) driver).getScreenshotAs(OutputType.BYTES);
        Files.write(SHOTS.resolve(name), png);
    }

    /** Points of the first series path of a chart figure on the page. */
    static int plottedPoints(String chart) {
        WebElement path = driver.findElement(By.cssSelector("figure[data-chart='" + chart + "'] svg path.series"));
        return path.getAttribute("d").trim().split("\\s+").length;
    }

    @Test
    void anAnalystPastesATokenAndBrowsesTheLibraryAFactorAndTheThemes() throws IOException {
        driver.get(server.uri("/").toString());
        assertEquals("Winnow factor library", driver.getTitle());
        WebElement field = driver.findElement(By.id("token"));
        assertEquals("API token", driver.findElement(By.cssSelector("label[for='token']")).getText());
        field.sendKeys(TestServer.ADMIN);
        driver.findElement(By.id("token-use")).click();

        // the library: every demo factor, with its verdicts in words once its evidence has arrived
        waiting(60).until(d -> d.findElements(By.cssSelector("#library tbody tr")).size() == 15);
        waiting(240).until(d -> d.findElements(By.cssSelector("#library td.verdict-cell .pending")).isEmpty());
        waiting(60).until(d -> d.findElements(By.cssSelector("#library td svg.spark polyline")).size() == 15);
        List<String> names = driver.findElements(By.cssSelector("#library a.factor-link")).stream().map(WebElement::getText).toList();
        assertTrue(names.containsAll(List.of("market", "size", "value", "momentum", "quality", "noise_alpha", "term")), names.toString());
        List<WebElement> badges = driver.findElements(By.cssSelector("#library .verdict"));
        assertEquals(15 * 7, badges.size(), "seven verdicts per factor");
        for (WebElement b : badges) {
            assertTrue(BADGE.matcher(b.getText()).matches(), "verdict in words: " + b.getText());
        }
        WebElement valueRow = driver.findElement(By.cssSelector("#library tr[data-factor='value']"));
        assertTrue(valueRow.getText().contains("value"), valueRow.getText());
        assertFalse(driver.getCurrentUrl().contains(TestServer.ADMIN), "the token is not in the URL");
        assertEquals(TestServer.ADMIN, ((JavascriptExecutor) driver).executeScript("return sessionStorage.getItem('winnow.token')"));
        assertEquals("", driver.findElement(By.id("token")).getAttribute("value"), "the field is cleared after use");
        screenshot("library.png");

        // a factor, opened from the keyboard
        driver.findElement(By.cssSelector("#library a.factor-link[href='#factor/value']")).sendKeys(Keys.ENTER);
        waiting(60).until(d -> d.findElements(By.cssSelector("figure[data-chart='significance'] svg path.series")).size() == 1);
        assertEquals("value", driver.findElement(By.tagName("h1")).getText());
        assertEquals("value", ((JavascriptExecutor) driver).executeScript("return document.activeElement.textContent"),
                "focus moves to the new view's heading");
        // 300 month-ends in the demo: the spread's wealth index has one point per monthly return
        assertTrue(plottedPoints("cumulative") >= 290, "cumulative points: " + plottedPoints("cumulative"));
        assertTrue(plottedPoints("drawdowns") >= 290);
        assertTrue(plottedPoints("significance") >= 200);
        assertEquals(3, driver.findElements(By.cssSelector("figure[data-chart='cumulative'] svg path.series")).size(), "spread and both legs");
        // value is a size_sort: its six 2x3 portfolios as bars, and the mean IC of its signal at the page's four horizons
        assertEquals(6, driver.findElements(By.cssSelector("figure[data-chart='portfolios'] svg rect.bar")).size());
        assertEquals(4, driver.findElements(By.cssSelector("figure[data-chart='ic'] svg rect.bar")).size());
        waiting(120).until(d -> d.findElements(By.cssSelector("#sections section[data-section]")).size() == 7);
        for (WebElement section : driver.findElements(By.cssSelector("#sections section[data-section] .verdict"))) {
            assertTrue(BADGE.matcher(section.getText()).matches(), section.getText());
        }
        assertTrue(driver.findElement(By.cssSelector("pre.definition")).getText().contains("\"method\": \"size_sort\""));
        screenshot("factor.png");

        // the log scale switch redraws the cumulative chart on a log axis
        driver.findElement(By.id("opt-log")).sendKeys(Keys.SPACE);
        waiting(60).until(d -> "log10".equals(d.findElement(By.cssSelector("figure[data-chart='cumulative'] svg [data-y-scale]"))
                .getAttribute("data-y-scale")));

        // themes: declared themes beside the clusters, and the heatmap
        driver.findElement(By.id("nav-themes")).click();
        waiting(120).until(d -> d.findElements(By.cssSelector("figure[data-chart='correlations'] svg rect.cell")).size() > 0);
        assertTrue(driver.findElement(By.id("declared")).getText().contains("value: value, value_annual_june, value_quintile_cap"),
                driver.findElement(By.id("declared")).getText());
        assertFalse(driver.findElements(By.cssSelector("#clusters li")).isEmpty());
        screenshot("themes.png");

        List<LogEntry> errors = driver.manage().logs().get(LogType.BROWSER).getAll().stream()
                .filter(e -> e.getLevel().intValue() >= Level.SEVERE.intValue()).toList();
        assertEquals(List.of(), errors.stream().map(LogEntry::getMessage).toList(), "the browser console logged errors");
    }
}
