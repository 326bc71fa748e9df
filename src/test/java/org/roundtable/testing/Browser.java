package org.roundtable.testing;

import org.junit.jupiter.api.Assumptions;
import org.openqa.selenium.OutputType;
import org.openqa.selenium.TakesScreenshot;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.chrome.ChromeDriver;
import org.openqa.selenium.chrome.ChromeDriverService;
import org.openqa.selenium.chrome.ChromeOptions;

import org.openqa.selenium.WebDriverException;

import java.io.File;
import java.lang.reflect.InvocationHandler;
import java.lang.reflect.InvocationTargetException;
import java.lang.reflect.Proxy;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;

/**
 * Headless Chromium for page tests, 1366 × 900. Where no browser is installed the test is skipped visibly (a
 * JUnit assumption names what is missing) — unless {@code REQUIRE_BROWSER=true}, as in CI, where a missing
 * browser fails the run.
 *
 * <p>Every page the test visits is checked once it has loaded ({@link PageChecks}: no domain constant name in
 * the visible text, no serious or critical axe-core violation). The check runs on the driver's next call after
 * a page has loaded and on {@code quit()}; {@code quit()} fails the test with every problem found.
 * {@code PAGE_CHECKS=off} turns the checks off for a local run.
 */
public final class Browser {

    private static final String[] CHROMIUM = {"/usr/bin/chromium", "/usr/bin/chromium-browser", "/usr/bin/google-chrome"};
    private static final String[] DRIVER = {"/usr/bin/chromedriver", "/usr/lib/chromium/chromedriver"};

    private Browser() {
    }

    /** Starts a fresh headless browser; the caller quits it. */
    public static WebDriver start() {
        String chromium = firstExisting(CHROMIUM);
        String driver = firstExisting(DRIVER);
        if (chromium == null || driver == null) {
            String missing = "Chromium or ChromeDriver is not installed (apt-get install chromium chromium-driver)";
            if ("true".equalsIgnoreCase(System.getenv("REQUIRE_BROWSER"))) {
                throw new IllegalStateException(missing + " but REQUIRE_BROWSER=true");
            }
            Assumptions.abort("Browser test skipped: " + missing);
        }
        ChromeOptions options = new ChromeOptions();
        options.setBinary(chromium);
        options.addArguments("--headless=new", "--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage",
                "--disable-background-networking", "--disable-component-update", "--disable-sync",
                "--no-first-run", "--disable-quic", "--window-size=1366,900", "--user-data-dir=" + tempProfile());
        ChromeDriverService service = new ChromeDriverService.Builder()
                .usingDriverExecutable(new File(driver))
                .usingAnyFreePort()
                .build();
        ChromeDriver chrome = new ChromeDriver(service, options);
        chrome.manage().timeouts().pageLoadTimeout(Duration.ofSeconds(30));
        // the page area itself is 1366 × 900 (the window size includes the browser's own frame)
        chrome.executeCdpCommand("Emulation.setDeviceMetricsOverride",
                java.util.Map.of("width", 1366, "height", 900, "deviceScaleFactor", 1, "mobile", false));
        if ("off".equalsIgnoreCase(System.getenv("PAGE_CHECKS"))) {
            return chrome;
        }
        return checked(chrome);
    }

    /** Scripts that mark a loaded page as checked; answer true only the first time for a loaded page. */
    private static final String FIRST_LOOK = "if (document.readyState !== 'complete' || window.__roundtableChecked) "
            + "{ return false; } window.__roundtableChecked = true; return true;";

    private static WebDriver checked(ChromeDriver chrome) {
        List<String> problems = new ArrayList<>();
        boolean[] checking = {false};
        Runnable look = () -> {
            if (checking[0]) {
                return;
            }
            checking[0] = true;
            try {
                if (Boolean.TRUE.equals(chrome.executeScript(FIRST_LOOK))) {
                    for (String problem : PageChecks.problemsOf(chrome)) {
                        if (!problems.contains(problem)) {
                            problems.add(problem);
                        }
                    }
                }
            } catch (WebDriverException navigatedAway) {
                // the page went while it was read: the next page is checked on the next call
            } finally {
                checking[0] = false;
            }
        };
        Set<Class<?>> interfaces = new LinkedHashSet<>();
        for (Class<?> c = chrome.getClass(); c != null; c = c.getSuperclass()) {
            interfaces.addAll(Arrays.asList(c.getInterfaces()));
        }
        InvocationHandler handler = (proxy, method, args) -> {
            String name = method.getName();
            if (name.equals("quit")) {
                look.run();
                try {
                    chrome.quit();
                } finally {
                    if (!problems.isEmpty()) {
                        throw new AssertionError("Pages failed the page checks:\n  " + String.join("\n  ", problems));
                    }
                }
                return null;
            }
            if (!name.equals("getScreenshotAs") && !name.equals("executeScript") && !name.equals("close")) {
                look.run();
            }
            try {
                return method.invoke(chrome, args);
            } catch (InvocationTargetException e) {
                throw e.getCause();
            }
        };
        return (WebDriver) Proxy.newProxyInstance(Browser.class.getClassLoader(), interfaces.toArray(new Class<?>[0]),
                handler);
    }

    /**
     * Waits (up to 20 s) for an element after a click that submits a form: on a busy machine the click can return
     * before the next page has loaded.
     */
    public static org.openqa.selenium.WebElement waitFor(WebDriver driver, org.openqa.selenium.By locator) {
        return new org.openqa.selenium.support.ui.WebDriverWait(driver, Duration.ofSeconds(20))
                .until(org.openqa.selenium.support.ui.ExpectedConditions.presenceOfElementLocated(locator));
    }

    /**
     * Clicks a button that submits a form and waits (up to 20 s) until the page that answers it has replaced the
     * current one, so that what the test looks for next is not found on the old page. While the browser navigates,
     * asking about the old page can also fail with an error other than "stale"; those answers are asked again.
     */
    public static void submit(WebDriver driver, org.openqa.selenium.By button) {
        org.openqa.selenium.WebElement page = driver.findElement(org.openqa.selenium.By.tagName("html"));
        driver.findElement(button).click();
        new org.openqa.selenium.support.ui.WebDriverWait(driver, Duration.ofSeconds(20))
                .ignoring(org.openqa.selenium.WebDriverException.class)
                .until(d -> {
                    try {
                        page.isEnabled();
                        return false;
                    } catch (org.openqa.selenium.StaleElementReferenceException gone) {
                        return true;
                    }
                });
    }

    /** Waits (up to 20 s) until the current address satisfies the condition. */
    public static void waitForUrl(WebDriver driver, java.util.function.Predicate<String> condition) {
        new org.openqa.selenium.support.ui.WebDriverWait(driver, Duration.ofSeconds(20))
                .until(d -> condition.test(d.getCurrentUrl()));
    }

    /**
     * Signs {@code username} in through the sign-in form of the server at {@code base} (ending in "/"), with the
     * tests' password, and waits until the browser has left the sign-in page.
     */
    public static void signIn(WebDriver driver, Object base, String username) {
        signIn(driver, base, username, World.PASSWORD);
    }

    /** As {@link #signIn(WebDriver, Object, String)} with the given password (the demo's, for instance). */
    public static void signIn(WebDriver driver, Object base, String username, String password) {
        driver.get(base + "login");
        driver.findElement(org.openqa.selenium.By.id("username")).sendKeys(username);
        driver.findElement(org.openqa.selenium.By.id("password")).sendKeys(password);
        submit(driver, org.openqa.selenium.By.cssSelector("form[action='/login'] button[type=submit]"));
        waitForUrl(driver, url -> !url.contains("/login"));
    }

    /** Saves a screenshot under target/screenshots for a person to look at. */
    public static void screenshot(WebDriver driver, String name) {
        try {
            Path file = Path.of("target", "screenshots").resolve(name + ".png");
            Files.createDirectories(file.getParent());
            byte[] png = ((TakesScreenshot) driver).getScreenshotAs(OutputType.BYTES);
            Files.write(file, png);
        } catch (IOException e) {
            throw new IllegalStateException("could not save screenshot " + name, e);
        }
    }

    /**
     * A screenshot for a guide in docs/: saved as {@link #screenshot} does under target/screenshots/guides/, and,
     * when the system property {@code guides.images} names a folder (mvn test -Dguides.images=docs/images), also
     * as {@code <folder>/<guide>/<name>.png}, the image the guide links.
     */
    public static void guideImage(WebDriver driver, String guide, String name) {
        screenshot(driver, "guides/" + guide + "/" + name);
        String folder = System.getProperty("guides.images");
        if (folder == null || folder.isBlank()) {
            return;
        }
        try {
            Path target = Path.of(folder, guide, name + ".png");
            Files.createDirectories(target.getParent());
            Files.copy(Path.of("target", "screenshots", "guides", guide, name + ".png"), target,
                    java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        } catch (IOException e) {
            throw new IllegalStateException("could not copy the guide image " + name, e);
        }
    }

    private static String tempProfile() {
        try {
            return Files.createTempDirectory("roundtable-chromium").toString();
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    private static String firstExisting(String[] candidates) {
        for (String candidate : candidates) {
            if (new File(candidate).canExecute()) {
                return candidate;
            }
        }
        return null;
    }
}
