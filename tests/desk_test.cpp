// trivet desk: the server's pure parts (the Host check against DNS
// rebinding, download names). The server end to end: desk_server_test.py.
#include <gtest/gtest.h>

#include "harness/desk/server.h"

namespace {

using trivet::desk::download_name;
using trivet::desk::host_allowed;

TEST(DeskHost, LoopbackNamesWithThePortAreAnswered) {
  EXPECT_TRUE(host_allowed("127.0.0.1:8320", "127.0.0.1", 8320));
  EXPECT_TRUE(host_allowed("localhost:8320", "127.0.0.1", 8320));
  EXPECT_TRUE(host_allowed("LocalHost:8320", "127.0.0.1", 8320));
  EXPECT_TRUE(host_allowed("[::1]:8320", "127.0.0.1", 8320));
}

TEST(DeskHost, OtherNamesPortsAndLookalikesAreRefused) {
  EXPECT_FALSE(host_allowed("", "127.0.0.1", 8320));
  EXPECT_FALSE(host_allowed("127.0.0.1", "127.0.0.1", 8320));  // no port: not what a browser sends for 8320
  EXPECT_FALSE(host_allowed("127.0.0.1:8321", "127.0.0.1", 8320));
  EXPECT_FALSE(host_allowed("attacker.example:8320", "127.0.0.1", 8320));
  EXPECT_FALSE(host_allowed("localhost.attacker.example:8320", "127.0.0.1", 8320));
  EXPECT_FALSE(host_allowed("127.0.0.1:8320.attacker.example", "127.0.0.1", 8320));
  EXPECT_FALSE(host_allowed("127.0.0.1:8320 ", "127.0.0.1", 8320));
  EXPECT_FALSE(host_allowed("127.0.0.1:8320", "127.0.0.1", 0));  // not listening yet
}

TEST(DeskHost, TheListeningAddressIsAnswered) {
  EXPECT_TRUE(host_allowed("192.168.4.20:9000", "192.168.4.20", 9000));
  EXPECT_FALSE(host_allowed("192.168.4.21:9000", "192.168.4.20", 9000));
  EXPECT_TRUE(host_allowed("[fd00::5]:9000", "fd00::5", 9000));
  // Port 80: a browser leaves the port out.
  EXPECT_TRUE(host_allowed("localhost", "127.0.0.1", 80));
  EXPECT_TRUE(host_allowed("localhost:80", "127.0.0.1", 80));
}

TEST(DeskOrigin, OnlyTheDesksOwnPageMayPost) {
  using trivet::desk::origin_allowed;
  EXPECT_TRUE(origin_allowed("http://127.0.0.1:8320", "127.0.0.1", 8320));
  EXPECT_TRUE(origin_allowed("http://localhost:8320", "127.0.0.1", 8320));
  EXPECT_TRUE(origin_allowed("http://[::1]:8320", "127.0.0.1", 8320));
  EXPECT_FALSE(origin_allowed("null", "127.0.0.1", 8320));
  EXPECT_FALSE(origin_allowed("", "127.0.0.1", 8320));
  EXPECT_FALSE(origin_allowed("http://attacker.example", "127.0.0.1", 8320));
  EXPECT_FALSE(origin_allowed("http://localhost:3000", "127.0.0.1", 8320));  // another local server's page
  EXPECT_FALSE(origin_allowed("https://127.0.0.1:8320", "127.0.0.1", 8320));
  EXPECT_FALSE(origin_allowed("http://127.0.0.1:8320/", "127.0.0.1", 8320));
  EXPECT_FALSE(origin_allowed("http://user@127.0.0.1:8320", "127.0.0.1", 8320));
  EXPECT_FALSE(origin_allowed("file://", "127.0.0.1", 8320));
}

TEST(DeskDownloadName, TitleMadeSafeForAFileName) {
  EXPECT_EQ(download_name("Floor beam, grid C", "beam", ".html"), "Floor beam- grid C.html");
  EXPECT_EQ(download_name("", "core-wall-beam", ".html"), "core-wall-beam.html");
  EXPECT_EQ(download_name("../../etc/passwd", "beam", ".html"), "etc-passwd.html");
  EXPECT_EQ(download_name("a\"b\\c/d\r\ne", "beam", ".html"), "a-b-c-d--e.html");
  EXPECT_EQ(download_name("...", "beam", ".html"), "beam.html");
  EXPECT_EQ(download_name("Tr\xC3\xA4ger", "beam", ".html"), "Tr--ger.html");  // no bytes past ASCII in a header
  EXPECT_EQ(download_name(std::string(200, 'x'), "beam", ".html"), std::string(80, 'x') + ".html");
}

}  // namespace
