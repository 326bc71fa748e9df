package org.roundtable.demo;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URL;
import java.nio.file.Path;
import java.time.Duration;
import java.util.function.Function;
import org.openqa.selenium.By;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.support.ui.WebDriverWait;
import org.roundtable.account.DemoAccounts;
import org.roundtable.job.JobRunner;
import org.roundtable.testing.Browser;

/**
 * What the guide tests share: one headless browser on the demo, signing in with the demo's password, the
 * screenshots a guide links ({@link Browser#guideImage}), and the waits and clicks of the steps.
 */
final class GuideWalk implements AutoCloseable {

    final WebDriver browser;
    private final URL home;
    private final String guide;
    private final JobRunner jobs;

    GuideWalk(URL home, String guide, JobRunner jobs) {
        this.browser = Browser.start();
        this.home = home;
        this.guide = guide;
        this.jobs = jobs;
    }

    /** Signs in as a demo account through the sign-in form (after signing the previous one out). */
    void signIn(String username) {
        browser.manage().deleteAllCookies();
        Browser.signIn(browser, home, username, DemoAccounts.DEMO_PASSWORD);
    }

    void open(String path) {
        browser.get(home + path.replaceFirst("^/", ""));
    }

    /** The screenshot of a guide's step: docs/images/&lt;guide&gt;/&lt;name&gt;.png when -Dguides.images is set. */
    void image(String name) {
        Browser.guideImage(browser, guide, name);
    }

    WebElement find(By by) {
        return browser.findElement(by);
    }

    String text(By by) {
        return browser.findElement(by).getText();
    }

    /** Follows a link or submits a form by its button and waits for the next page. */
    void click(By by) {
        show(browser.findElement(by));
        Browser.submit(browser, by);
    }

    void clickLink(String linkText) {
        click(By.linkText(linkText));
    }

    /** Submits by a button and waits for the success notice of the answering page. */
    void clickForNotice(By by) {
        click(by);
        Browser.waitFor(browser, By.cssSelector(".notice-ok"));
    }

    void type(By by, String text) {
        WebElement field = browser.findElement(by);
        show(field);
        field.clear();
        field.sendKeys(text);
    }

    void upload(By by, Path file) {
        browser.findElement(by).sendKeys(file.toAbsolutePath().toString());
    }

    void show(WebElement element) {
        ((JavascriptExecutor) browser).executeScript("arguments[0].scrollIntoView({block: 'center'});", element);
    }

    void show(By by) {
        show(browser.findElement(by));
    }

    void top() {
        ((JavascriptExecutor) browser).executeScript("window.scrollTo(0, 0);");
    }

    void waitUntil(Function<WebDriver, Boolean> condition) {
        new WebDriverWait(browser, Duration.ofSeconds(30))
                .ignoring(org.openqa.selenium.StaleElementReferenceException.class)
                .ignoring(org.openqa.selenium.NoSuchElementException.class)
                .until(condition::apply);
    }

    /** Runs the queued background jobs (the test profile polls none), as the demo server's workers would. */
    void runJobs() {
        for (int i = 0; i < 10_000 && jobs.runNext(); i++) {
            // evaluation runs, report issues, notices
        }
    }

    /** What a link gives the signed-in browser (a PDF, say), fetched with its session, as a download would. */
    byte[] download(String href) {
        String url = href.startsWith("http") ? href : home + href.replaceFirst("^/", "");
        try {
            java.net.http.HttpResponse<byte[]> answer = java.net.http.HttpClient.newHttpClient().send(
                    java.net.http.HttpRequest.newBuilder(java.net.URI.create(url))
                            .header("Cookie", "rt_session=" + browser.manage().getCookieNamed("rt_session").getValue())
                            .GET().build(), java.net.http.HttpResponse.BodyHandlers.ofByteArray());
            if (answer.statusCode() != 200) {
                throw new IllegalStateException(url + " answered " + answer.statusCode());
            }
            return answer.body();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException(e);
        }
    }

    /** Saves bytes as a file to upload (a downloaded report, say). */
    static Path saved(byte[] bytes, String name) {
        try {
            Path dir = java.nio.file.Files.createTempDirectory("guide");
            Path file = dir.resolve(name);
            java.nio.file.Files.write(file, bytes);
            file.toFile().deleteOnExit();
            dir.toFile().deleteOnExit();
            return file;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    static String sha256(byte[] bytes) {
        try {
            return java.util.HexFormat.of().formatHex(java.security.MessageDigest.getInstance("SHA-256").digest(bytes));
        } catch (java.security.NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    static Path demoFile(String name) {
        Path file = Path.of("rounds-demo", "files", name);
        if (!file.toFile().isFile()) {
            throw new UncheckedIOException(new IOException("missing demo file " + file));
        }
        return file;
    }

    @Override
    public void close() {
        browser.quit();
    }
}
